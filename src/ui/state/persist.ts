/**
 * Decisions survive a reload: they are kept in localStorage under the open file's fingerprint
 * (name + size + hash of its first and last 64 KB, see src/worker/fingerprint.ts). Reopening the
 * same file drafts its recipe again and replays them. The missing spellings go with them when the
 * person changed them: the file is then profiled with those before the decisions are replayed.
 * Only decisions and spellings are stored — never cell values — and at most SAVED_FILES_LIMIT
 * files are remembered, the least recently used going first.
 */
import type { Decision } from '../../core/decisions.ts';

const PREFIX = 'levelwise.decisions.v1:';
const INDEX_KEY = 'levelwise.decisions.v1';
export const SAVED_FILES_LIMIT = 20;

/** The part of the Storage interface used here, so tests can pass a Map-backed stand-in. */
export type KeyValueStore = Pick<Storage, 'getItem' | 'setItem' | 'removeItem'>;

interface SavedDecisions {
  readonly savedAt: string;
  readonly decisions: readonly Decision[];
  /** The missing spellings, when not the usual ones. */
  readonly missingTokens?: readonly string[];
}

export function browserStore(): KeyValueStore | null {
  try {
    return globalThis.localStorage ?? null;
  } catch {
    return null; // storage disabled by the browser's privacy settings
  }
}

export function loadDecisions(store: KeyValueStore | null, fingerprint: string): Decision[] {
  const saved = readSaved(store, fingerprint);
  return Array.isArray(saved?.decisions) ? saved.decisions.filter(isDecisionLike) : [];
}

/** The missing spellings saved for the file, or null when it was read with the usual ones. */
export function loadMissingTokens(store: KeyValueStore | null, fingerprint: string): string[] | null {
  const tokens = readSaved(store, fingerprint)?.missingTokens;
  return Array.isArray(tokens) && tokens.every((t) => typeof t === 'string') ? [...tokens] : null;
}

function readSaved(store: KeyValueStore | null, fingerprint: string): Partial<SavedDecisions> | null {
  if (store === null) return null;
  try {
    const text = store.getItem(PREFIX + fingerprint);
    return text === null ? null : (JSON.parse(text) as Partial<SavedDecisions>);
  } catch {
    return null;
  }
}

/**
 * Returns false when the browser refused to store (quota, privacy mode); the page keeps working.
 * `missingTokens`: the spellings the file is read with, when not the usual ones.
 */
export function saveDecisions(
  store: KeyValueStore | null,
  fingerprint: string,
  decisions: readonly Decision[],
  now = new Date(),
  missingTokens: readonly string[] | null = null,
): boolean {
  if (store === null) return false;
  try {
    const index = readIndex(store).filter((f) => f !== fingerprint);
    if (decisions.length === 0 && missingTokens === null) {
      store.removeItem(PREFIX + fingerprint);
      store.setItem(INDEX_KEY, JSON.stringify(index));
      return true;
    }
    index.push(fingerprint);
    for (const old of index.splice(0, Math.max(0, index.length - SAVED_FILES_LIMIT))) store.removeItem(PREFIX + old);
    const saved: SavedDecisions = { savedAt: now.toISOString(), decisions, ...(missingTokens === null ? {} : { missingTokens }) };
    store.setItem(PREFIX + fingerprint, JSON.stringify(saved));
    store.setItem(INDEX_KEY, JSON.stringify(index));
    return true;
  } catch {
    return false;
  }
}

export function forgetDecisions(store: KeyValueStore | null, fingerprint: string): void {
  saveDecisions(store, fingerprint, []);
}

function readIndex(store: KeyValueStore): string[] {
  try {
    const parsed: unknown = JSON.parse(store.getItem(INDEX_KEY) ?? '[]');
    return Array.isArray(parsed) ? parsed.filter((f): f is string => typeof f === 'string') : [];
  } catch {
    return [];
  }
}

function isDecisionLike(value: unknown): value is Decision {
  return typeof value === 'object' && value !== null && typeof (value as { type?: unknown }).type === 'string';
}
