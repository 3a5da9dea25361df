/**
 * The largest files the page opens. The page keeps the whole table in this browser tab's memory
 * (column storage in the worker), so past some size a tab runs out of memory and dies, taking
 * the person's decisions with it. A file above the limit is refused before a byte of it is read,
 * with the reason and the way out: the command line streams files of any size with the same
 * recipe and gives the same bytes.
 *
 * The limits are deliberately round and generous; a file near them may still be slow. Tests
 * lower them through the open request (the page passes `?max-file-mb=` from its address on).
 */
import { LevelwiseError } from '../core/errors.ts';

/** Delimited text: about 8 million rows of a 20-column survey export. */
export const MAX_PAGE_FILE_BYTES = 1024 * 1024 * 1024;
/** An XLSX workbook is unpacked whole and every cell held as an object: a far lower limit. */
export const MAX_PAGE_WORKBOOK_BYTES = 64 * 1024 * 1024;

export type FileKind = 'text' | 'workbook';

/** The limit for a file of `kind`; `override` (bytes, from the request) replaces the text limit and caps the workbook one. */
export function pageLimit(kind: FileKind, override?: number): number {
  const text = override !== undefined && override > 0 ? override : MAX_PAGE_FILE_BYTES;
  return kind === 'text' ? text : Math.min(text, MAX_PAGE_WORKBOOK_BYTES);
}

export function tooLargeForPage(name: string, size: number, kind: FileKind, limit: number): LevelwiseError {
  const what = kind === 'workbook' ? 'workbooks' : 'files';
  return new LevelwiseError(
    'too-large-for-page',
    `“${name}” is ${sizeText(size)}; the page opens ${what} up to ${sizeText(limit)}, because it holds the whole table in this tab's memory. Nothing was read.`,
    {
      hint:
        `Use the command line, which streams files of any size: levelwise draft "${name}" -o recipe.json proposes a recipe, ` +
        `and levelwise apply recipe.json "${name}" -o encoded.csv encodes the file.` +
        (kind === 'workbook' ? ' Or save the sheet as CSV and open that here.' : ''),
    },
  );
}

/** A compressed file whose unpacked text passes the limit: found out while reading, so part of it was read. */
export function tooLargeUnpacked(name: string, size: number, limit: number): LevelwiseError {
  return new LevelwiseError(
    'too-large-for-page',
    `“${name}” (${sizeText(size)} compressed) unpacks to more than ${sizeText(limit)}; the page opens files up to ${sizeText(limit)}, because it holds the whole table in this tab's memory. Reading stopped there.`,
    {
      hint: `Use the command line, which streams compressed files of any size: levelwise draft "${name}" -o recipe.json proposes a recipe, and levelwise apply recipe.json "${name}" -o encoded.csv encodes the file.`,
    },
  );
}

/** Sizes in the units the limits are stated in (powers of 1024). */
export function sizeText(bytes: number): string {
  const units = ['bytes', 'KB', 'MB', 'GB'];
  let value = bytes;
  let unit = 0;
  while (value >= 1024 && unit < units.length - 1) {
    value /= 1024;
    unit++;
  }
  return `${unit === 0 ? value : value.toFixed(value < 10 ? 1 : 0)} ${units[unit]}`;
}
