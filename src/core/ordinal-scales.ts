/**
 * Ordered scales the trade writes as words or bands. Given a column's (cleaned) levels, find the
 * scale they all belong to and return them in that scale's order, lowest first.
 *
 * Matching ignores case, surrounding spaces, and treats runs of spaces, "_" and "-" between words
 * alike ("Very_High" is "very high"). A column may use only part of a scale. Two levels that are
 * spellings of the same step ("often", "frequently") make the order ambiguous: no match.
 * The scales are common practice in surveys, retail and pricing; none is taken from one source.
 */

export interface OrdinalScale {
  /** Short name used in reasons, e.g. "agreement". */
  readonly name: string;
  /** Steps lowest first; each step lists its accepted spellings (lower case, single spaces). */
  readonly steps: readonly (readonly string[])[];
}

export interface ScaleMatch {
  /** Name of the matched scale ("agreement", "numbered bands", …). */
  readonly scale: string;
  /** The given levels in the scale's order, lowest first, spelled as given. */
  readonly order: string[];
}

const ORDINAL_WORDS = [
  'first', 'second', 'third', 'fourth', 'fifth', 'sixth', 'seventh', 'eighth', 'ninth', 'tenth',
  'eleventh', 'twelfth', 'thirteenth', 'fourteenth', 'fifteenth', 'sixteenth', 'seventeenth',
  'eighteenth', 'nineteenth', 'twentieth',
];

export const ORDINAL_SCALES: readonly OrdinalScale[] = [
  {
    name: 'low–high',
    steps: [['none'], ['very low'], ['low'], ['medium', 'moderate', 'mid'], ['high'], ['very high']],
  },
  {
    name: 'frequency',
    steps: [
      ['never'],
      ['almost never'],
      ['rarely', 'seldom'],
      ['sometimes', 'occasionally'],
      ['often', 'frequently'],
      ['very often', 'usually'],
      ['almost always'],
      ['always'],
    ],
  },
  {
    name: 'agreement',
    steps: [
      ['strongly disagree', 'completely disagree', 'totally disagree'],
      ['disagree'],
      ['somewhat disagree', 'slightly disagree', 'tend to disagree', 'mildly disagree'],
      ['neither agree nor disagree', 'neither agree or disagree', 'neutral', 'undecided'],
      ['somewhat agree', 'slightly agree', 'tend to agree', 'mildly agree'],
      ['agree'],
      ['strongly agree', 'completely agree', 'totally agree'],
    ],
  },
  {
    name: 'satisfaction',
    steps: [
      ['very dissatisfied', 'very unsatisfied', 'extremely dissatisfied'],
      ['dissatisfied', 'unsatisfied'],
      ['somewhat dissatisfied', 'slightly dissatisfied'],
      ['neither satisfied nor dissatisfied', 'neither satisfied or dissatisfied', 'neutral'],
      ['somewhat satisfied', 'slightly satisfied'],
      ['satisfied'],
      ['very satisfied', 'extremely satisfied', 'completely satisfied'],
    ],
  },
  {
    name: 'quality',
    steps: [['very poor'], ['poor'], ['fair'], ['good'], ['very good'], ['excellent']],
  },
  {
    name: 'relative to average',
    steps: [['well below average'], ['below average'], ['average'], ['above average'], ['well above average']],
  },
  {
    name: 'importance',
    steps: [
      ['not at all important', 'not important'],
      ['slightly important'],
      ['moderately important', 'somewhat important'],
      ['important'],
      ['very important'],
      ['extremely important'],
    ],
  },
  {
    name: 'likelihood',
    steps: [
      ['very unlikely'],
      ['unlikely'],
      ['neither likely nor unlikely', 'neutral'],
      ['likely'],
      ['very likely'],
    ],
  },
  {
    name: 'clothing size',
    steps: [
      ['xxxs', '3xs'],
      ['xxs', '2xs'],
      ['xs', 'extra small'],
      ['s', 'small'],
      ['m', 'medium'],
      ['l', 'large'],
      ['xl', 'extra large'],
      ['xxl', '2xl'],
      ['xxxl', '3xl'],
      ['xxxxl', '4xl'],
    ],
  },
  {
    name: 'service tier',
    steps: [['free'], ['basic'], ['standard'], ['premium']],
  },
  {
    name: 'metal tier',
    steps: [['bronze'], ['silver'], ['gold'], ['platinum']],
  },
  {
    name: 'ordinal words',
    steps: ORDINAL_WORDS.map((word) => [word]),
  },
];

/**
 * More levels than this are no scale a person reads as ordered (the longest scale above has 20
 * steps); the limit also keeps identifier columns with a million levels cheap.
 */
export const MAX_SCALE_LEVELS = 50;

/** Lower case, trimmed, with spaces, "_" and "-" between words made one space. */
export function scaleKey(level: string): string {
  return level.trim().toLowerCase().replace(/[\s_-]+/g, ' ');
}

/**
 * The levels' order in the first scale that holds every one of them, or null. At least two
 * levels are needed. Tried in turn: the word scales above, "1st/2nd/3rd" numbering, then
 * numbered bands ("18-24", "65+", "under 18", "$10k-$20k") sorted by their lower bound.
 */
export function matchOrdinalScale(levels: readonly string[]): ScaleMatch | null {
  if (levels.length < 2 || levels.length > MAX_SCALE_LEVELS) return null;
  for (const scale of ORDINAL_SCALES) {
    const order = orderBySteps(levels, scale);
    if (order !== null) return { scale: scale.name, order };
  }
  const numbered = orderByRankKey(levels, numberedOrdinal);
  if (numbered !== null) return { scale: 'numbered positions', order: numbered };
  const bands = orderBands(levels);
  if (bands !== null) return { scale: 'numbered bands', order: bands };
  return null;
}

/** The suggested order of `levels`, lowest first, or null when they match no known scale. */
export function suggestOrder(levels: readonly string[]): string[] | null {
  return matchOrdinalScale(levels)?.order ?? null;
}

function orderBySteps(levels: readonly string[], scale: OrdinalScale): string[] | null {
  const stepOf = new Map<string, number>();
  scale.steps.forEach((spellings, step) => {
    for (const spelling of spellings) stepOf.set(spelling, step);
  });
  return orderByRankKey(levels, (level) => stepOf.get(scaleKey(level)) ?? null);
}

/** Sorts by a rank every level must have; two levels of equal rank make the order ambiguous. */
function orderByRankKey(levels: readonly string[], rankOf: (level: string) => number | null): string[] | null {
  const ranked: { level: string; rank: number }[] = [];
  const seen = new Set<number>();
  for (const level of levels) {
    const rank = rankOf(level);
    if (rank === null || seen.has(rank)) return null;
    seen.add(rank);
    ranked.push({ level, rank });
  }
  return ranked.sort((a, b) => a.rank - b.rank).map((r) => r.level);
}

/** "1st" → 1, "22nd" → 22; null for anything else (including "2th"). */
function numberedOrdinal(level: string): number | null {
  const m = /^(\d{1,4})(st|nd|rd|th)$/.exec(scaleKey(level));
  if (m === null) return null;
  const n = Number(m[1]);
  const lastTwo = n % 100;
  const last = n % 10;
  const expected = lastTwo >= 11 && lastTwo <= 13 ? 'th' : last === 1 ? 'st' : last === 2 ? 'nd' : last === 3 ? 'rd' : 'th';
  return m[2] === expected ? n : null;
}

/** A numbered band: its bounds (open ends are ±Infinity), and whether it is a plain number. */
export interface Band {
  readonly lower: number;
  readonly upper: number;
  readonly single: boolean;
}

// A quantity in a band: optional currency sign, digits (with "," thousands), decimals, a k/m/bn
// multiplier or a percent sign.
const QUANTITY = String.raw`[$£€¥]?\s*(\d{1,3}(?:,\d{3})+|\d+)(\.\d+)?\s*(k|m|mn|bn|%)?`;
const UNIT = String.raw`(?:\s*(?:years? old|years?|yrs?|y\.o\.|months?|weeks?|days?|hours?|hrs?|minutes?|mins?|km|kg|miles?|people|persons?|employees|staff))?`;
const RANGE = new RegExp(String.raw`^${QUANTITY}${UNIT}\s*(?:-|–|—|to)\s*${QUANTITY}${UNIT}$`);
const BELOW = new RegExp(String.raw`^(?:<=?|≤|under|below|less than|fewer than|up to)\s*${QUANTITY}${UNIT}$`);
const ABOVE_PREFIX = new RegExp(String.raw`^(?:>=?|≥|over|above|more than|at least)\s*${QUANTITY}${UNIT}$`);
const ABOVE_SUFFIX = new RegExp(
  String.raw`^${QUANTITY}${UNIT}\s*(?:\+|plus|or more|and more|and over|or over|and above|or above|and older|or older)${UNIT}$`,
);
const SINGLE = new RegExp(String.raw`^${QUANTITY}${UNIT}$`);

const MULTIPLIER: Readonly<Record<string, number>> = { k: 1e3, m: 1e6, mn: 1e6, bn: 1e9 };

function quantity(digits: string | undefined, fraction: string | undefined, suffix: string | undefined): number {
  const base = Number((digits ?? '').replace(/,/g, '') + (fraction ?? ''));
  return base * (MULTIPLIER[suffix ?? ''] ?? 1);
}

/** Reads "18-24", "65+", "under 18", "$10k-$20k", "1,000 to 4,999", "3"; null when not a band. */
export function readBand(level: string): Band | null {
  const t = level.trim().toLowerCase().replace(/\s+/g, ' ');
  let m = RANGE.exec(t);
  if (m !== null) {
    const lower = quantity(m[1], m[2], m[3]);
    const upper = quantity(m[4], m[5], m[6]);
    return lower <= upper ? { lower, upper, single: false } : null;
  }
  m = BELOW.exec(t);
  if (m !== null) return { lower: -Infinity, upper: quantity(m[1], m[2], m[3]), single: false };
  m = ABOVE_PREFIX.exec(t) ?? ABOVE_SUFFIX.exec(t);
  if (m !== null) return { lower: quantity(m[1], m[2], m[3]), upper: Infinity, single: false };
  m = SINGLE.exec(t);
  if (m !== null) {
    const value = quantity(m[1], m[2], m[3]);
    return { lower: value, upper: value, single: true };
  }
  return null;
}

/**
 * Bands sorted by lower bound, then upper bound. Plain numbers may sit among bands ("1", "2-3",
 * "4+") but at least one level must be a real band; identical bands make the order ambiguous.
 */
function orderBands(levels: readonly string[]): string[] | null {
  const read: { level: string; band: Band }[] = [];
  for (const level of levels) {
    const band = readBand(level);
    if (band === null) return null;
    read.push({ level, band });
  }
  if (read.every((r) => r.band.single)) return null;
  read.sort((a, b) => compareNumbers(a.band.lower, b.band.lower) || compareNumbers(a.band.upper, b.band.upper));
  for (let i = 1; i < read.length; i++) {
    const prev = read[i - 1]?.band;
    const cur = read[i]?.band;
    if (prev !== undefined && cur !== undefined && prev.lower === cur.lower && prev.upper === cur.upper) return null;
  }
  return read.map((r) => r.level);
}

/** Unlike subtraction, safe for equal infinities. */
function compareNumbers(a: number, b: number): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
