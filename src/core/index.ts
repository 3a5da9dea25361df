/**
 * Levelwise core — the public API. Data flows one way:
 *
 *   bytes ──read──▶ Table ──profile──▶ ColumnProfile[] ──infer + fit──▶ Recipe ──plan + apply──▶ CSV / SQL
 *
 * Pure TypeScript: no React, no DOM, no node: modules. The page runs it in a Web Worker, the
 * command line in Node; both call the same functions and get the same bytes.
 */

// Reading: bytes → columns
export { decodeBytes, ChunkDecoder, type EncodingName } from './decode.ts';
export { readTable, createTableReader, readTableFromSource, tableFromRows, type ReadOptions, type ReadResult, type TableReader, type Delimiter } from './read-table.ts';
export { cellText, type Column, type TextColumn, type NumberColumn, type Table, type RowIssue, type HeaderIssue } from './columns.ts';
export { LevelwiseError, isLevelwiseError } from './errors.ts';
// Reading on several threads: the first segment with createTableReader's `stopAt`, the others
// with createSegmentReader on the caller's threads, put in order and joined by readInParallel.
export { readInParallel, type ParallelRead, type SegmentRequest, type SegmentRunner } from './parallel-read.ts';
export { createSegmentReader, rebaseRows, type SegmentResult } from './read-segment.ts';
export { concatTables } from './concat-tables.ts';
export { tableBuffers } from './columns.ts';

// Understanding: columns → profile → proposed levels
export { profileTable, profileTableSharing, profileColumn, type ColumnProfile, type ColumnProfiler, type LevelCount, type NumericSummary } from './profile.ts';
export { inferLevel, sensitiveAttributeCaution, type Inference } from './infer.ts';
export { parseNumber, detectNumberFormat } from './numbers.ts';
export { missingTest } from './missing.ts';
export { cleaner } from './cleaning.ts';

// The recipe: decisions and what was learned
export { Recipe, ColumnRecipe, RECIPE_KIND, RECIPE_VERSION, DEFAULT_MISSING_TOKENS, LEVELS, type MeasurementLevel } from './recipe.ts';
export { parseRecipe, stringifyRecipe, consistencyProblems, recipeTooLargeMessage, MAX_RECIPE_BYTES, type RecipeParse } from './recipe-io.ts';
export { jsonErrorPosition, type TextPosition } from './json-position.ts';
export { MAX_CATEGORICAL_LEVELS, WIDE_DRAFT_KEEP_TOP } from './level-limit.ts';
export { recipeJsonSchema, recipeJsonSchemaText } from './recipe-schema.ts';
export { draftRecipe, draftColumn, refitColumn, MISSING_LEVEL, OTHER_LEVEL } from './fit.ts';
export { decide, type Decision } from './decisions.ts';
export { nameOutputs, safeIdentifier } from './names.ts';
export { forecastWidth, type WidthForecast, type ColumnWidth } from './width.ts';

// Encoding: recipe + rows → numbers
export { codesForColumn, transformForColumn, codesOf, type LevelCodes, type LinearTransform } from './encoders/index.ts';
export { compilePlan, type Plan, type ColumnPlan } from './plan.ts';
export { encodeBatch, encodeWindow, type EncodedBatch } from './apply.ts';
export { createApplyReport, type ApplyReport, type ColumnReport } from './apply-report.ts';

// Output
export { createCsvWriter, type CsvWriter } from './csv-write.ts';
export { encodeTable, encodeToCsv } from './encode-csv.ts';
export { neutraliseFormula, quoteCell, numberCell } from './csv-cell.ts';
export { codebookMarkdown, codebookHtml, codebookEntries } from './codebook.ts';
export { compileSql, sqlNotes, recipeCanReject, REJECTED_COLUMN, SQL_DIALECTS, type SqlOptions, type SqlDialectName } from './sql.ts';
export { spreadsheetCellText } from './spreadsheet-cell.ts';
