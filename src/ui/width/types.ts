/** The width forecast the meter reads comes from the core; re-exported so the panel imports one place. */
export type { ColumnWidth, WidthForecast } from '../../core/width.ts';
