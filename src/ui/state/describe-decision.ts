/** A decision in a few words, for the undo/redo buttons and the list of replayed decisions. */
import type { Decision } from '../../core/decisions.ts';
import { formatNumber } from '../../core/numbers.ts';

const NOMINAL_CODING = { 'one-hot': 'one-hot', dummy: 'dummy coding', effect: 'effect coding', frequency: 'frequency coding' } as const;
const ORDINAL_CODING = { rank: 'ranks', scores: 'custom scores', cumulative: 'cumulative coding' } as const;
const SCALING = { none: 'as is', 'z-score': 'z-score', 'min-max': 'min-max scaling' } as const;

export function describeDecision(decision: Decision): string {
  if (decision.type === 'set-naming') return `Output names: ${decision.naming}`;
  return `${decision.column}: ${whatChanged(decision)}`;
}

function whatChanged(decision: Exclude<Decision, { type: 'set-naming' }>): string {
  switch (decision.type) {
    case 'set-level':
      return decision.level;
    case 'set-nominal-coding':
      return NOMINAL_CODING[decision.coding];
    case 'set-ordinal-coding':
      return ORDINAL_CODING[decision.coding];
    case 'set-scaling':
      return SCALING[decision.scaling];
    case 'set-reference':
      return `reference level “${decision.reference}”`;
    case 'set-positive':
      return `“${decision.positive}” coded 1`;
    case 'set-start':
      return `ranks start at ${decision.start}`;
    case 'set-scores':
      return `scores ${decision.scores.join(', ')}`;
    case 'set-order':
      return 'new order';
    case 'reverse-order':
      return 'order reversed';
    case 'set-cleaning':
      return cleaningWords(decision.trim, decision.caseFold);
    case 'merge-levels':
      return `${decision.from.length} values merged into “${decision.into}”`;
    case 'undo-merge':
      return `merge into “${decision.into}” undone`;
    case 'set-rare':
      return 'rare-level rule';
    case 'set-categorical-missing':
    case 'set-continuous-missing':
      return `missing values: ${decision.missing.policy}${decision.missing.indicator ? ' + indicator' : ''}`;
    case 'set-unseen':
      return `unseen levels: ${decision.unseen}`;
    case 'set-invalid':
      return `unreadable numbers: ${decision.invalid === 'missing' ? 'treated as missing' : 'rejected'}`;
    case 'set-other-label':
      return `other level named “${decision.label}”`;
    case 'set-number-format':
      return `numbers written like ${formatNumber(1234.5, decision.format)}`;
  }
}

function cleaningWords(trim: boolean | undefined, caseFold: boolean | undefined): string {
  const parts: string[] = [];
  if (trim !== undefined) parts.push(trim ? 'trim spaces' : 'keep spaces');
  if (caseFold !== undefined) parts.push(caseFold ? 'ignore case' : 'respect case');
  return parts.join(', ') || 'cleaning';
}
