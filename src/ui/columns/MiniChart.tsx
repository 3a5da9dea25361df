/**
 * A very small inline SVG chart: bars of level counts, or a histogram (bars touching). It is a
 * glance, not a reading instrument, so it is hidden from screen readers; the row around it states
 * the counts in words.
 */
import type { ChartData } from './chart-data.ts';
import './MiniChart.css';

export interface MiniChartProps {
  readonly data: ChartData;
  readonly width?: number;
  readonly height?: number;
}

export function MiniChart({ data, width = 88, height = 28 }: MiniChartProps) {
  const max = Math.max(1, ...data.values);
  const n = Math.max(1, data.values.length);
  const gap = data.kind === 'histogram' ? 0 : Math.min(2, width / n / 4);
  const slot = width / n;
  return (
    <svg
      className={`lw-minichart lw-minichart--${data.kind}`}
      width={width}
      height={height}
      viewBox={`0 0 ${width} ${height}`}
      aria-hidden="true"
      focusable="false"
      data-kind={data.kind}
    >
      <title>{data.summary}</title>
      <line className="lw-minichart__base" x1={0} x2={width} y1={height - 0.5} y2={height - 0.5} />
      {data.values.map((value, i) => {
        // A non-zero count always gets a visible sliver, so rare levels do not vanish.
        const h = value === 0 ? 0 : Math.max(1.5, (value / max) * (height - 2));
        return (
          <rect
            key={i}
            className="lw-minichart__bar"
            x={i * slot + gap / 2}
            y={height - 1 - h}
            width={Math.max(0.5, slot - gap)}
            height={h}
            data-value={value}
          >
            <title>{`${data.labels[i] ?? ''}: ${value}`}</title>
          </rect>
        );
      })}
    </svg>
  );
}
