/**
 * Small tools the robustness tests share: bytes in the encodings spreadsheet programs write, and
 * the page's whole path (read → profile → draft → encode) in one call.
 */
import { draftRecipe } from '../../src/core/fit.ts';
import { encodeToCsv } from '../../src/core/encode-csv.ts';
import { profileTable, type ColumnProfile } from '../../src/core/profile.ts';
import { readTable, type ReadResult } from '../../src/core/read-table.ts';
import { DEFAULT_MISSING_TOKENS, type Recipe } from '../../src/core/recipe.ts';
import type { ApplyReport } from '../../src/core/apply-report.ts';

export const utf8 = (text: string): Uint8Array<ArrayBuffer> => new TextEncoder().encode(text);

/** UTF-16 little endian, with its byte order mark FF FE unless `mark` is false (Unicode §23.8). */
export function utf16le(text: string, mark = true): Uint8Array<ArrayBuffer> {
  const body = new Uint8Array(text.length * 2);
  for (let i = 0; i < text.length; i++) {
    body[2 * i] = text.charCodeAt(i) & 0xff;
    body[2 * i + 1] = text.charCodeAt(i) >> 8;
  }
  return mark ? concat(new Uint8Array([0xff, 0xfe]), body) : body;
}

/** UTF-16 big endian with its byte order mark FE FF. */
export function utf16be(text: string): Uint8Array<ArrayBuffer> {
  const body = new Uint8Array(text.length * 2);
  for (let i = 0; i < text.length; i++) {
    body[2 * i] = text.charCodeAt(i) >> 8;
    body[2 * i + 1] = text.charCodeAt(i) & 0xff;
  }
  return concat(new Uint8Array([0xfe, 0xff]), body);
}

/**
 * Windows-1252 bytes of text written in Latin-1 letters plus the few 0x80–0x9F characters used
 * here (WHATWG Encoding Standard, index-windows-1252: 0x80 €, 0x96 –, 0x92 ’).
 */
export function windows1252(text: string): Uint8Array<ArrayBuffer> {
  const special: Record<string, number> = { '€': 0x80, '–': 0x96, '’': 0x92 };
  return Uint8Array.from(text, (ch) => {
    const byte = special[ch] ?? ch.charCodeAt(0);
    if (byte > 0xff) throw new Error(`"${ch}" has no Windows-1252 byte in this helper`);
    return byte;
  });
}

export function concat(...parts: Uint8Array[]): Uint8Array<ArrayBuffer> {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const part of parts) {
    out.set(part, at);
    at += part.length;
  }
  return out;
}

export interface Pipeline {
  readonly read: ReadResult;
  readonly profiles: ColumnProfile[];
  readonly recipe: Recipe;
  readonly csv: string;
  readonly report: ApplyReport;
}

/** What the page does with a file: read, profile, draft, encode with the draft. */
export function pipeline(bytes: Uint8Array, file = 'input.csv'): Pipeline {
  const read = readTable(bytes);
  const profiles = profileTable(read.table, { missingTokens: DEFAULT_MISSING_TOKENS });
  const recipe = draftRecipe(profiles, { file, rows: read.table.rowCount });
  const { bytes: out, report } = encodeToCsv(recipe, read.table);
  return { read, profiles, recipe, csv: new TextDecoder().decode(out), report };
}

/** Runs `action` and returns what it threw (fails when it throws nothing). */
export function thrownBy(action: () => unknown): unknown {
  try {
    action();
  } catch (error) {
    return error;
  }
  throw new Error('expected a throw, none came');
}
