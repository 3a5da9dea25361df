/** The level of a column as a small tinted label; colour is never the only cue (the word is there). */
import type { MeasurementLevel } from '../../core/recipe.ts';
import { LEVEL_LABELS } from './labels.ts';
import './LevelBadge.css';

export interface LevelBadgeProps {
  readonly level: MeasurementLevel | null;
  readonly id?: string;
}

export function LevelBadge({ level, id }: LevelBadgeProps) {
  return (
    <span id={id} className="lw-level-badge" data-level={level ?? 'none'}>
      {level === null ? 'not decided' : LEVEL_LABELS[level]}
    </span>
  );
}
