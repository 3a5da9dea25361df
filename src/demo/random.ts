/**
 * Seeded pseudo-random numbers for invented demo data.
 *
 * The demo file must come out byte-identical in Node and in every browser, from the same seed. So everything here
 * is built from 32-bit integer operations (Math.imul, shifts) and the IEEE-754 operations +, −, ×, ÷ and sqrt,
 * which every JavaScript engine rounds the same way. Math.log, Math.cos and Math.exp are "implementation-
 * approximated" in ECMA-262 and may differ in the last bit between engines; a last-bit difference can flip a
 * rounded number in the output, so the logarithm below is computed with plain arithmetic instead.
 *
 * Not for anything that needs unpredictability (no cryptography, no sampling people).
 */

/** A stream of reproducible random values. Each call advances the stream. */
export interface Random {
  /** Uniform in [0, 1), with 32-bit resolution. */
  next(): number;
  /** A whole number in [min, max], both ends included. */
  int(min: number, max: number): number;
  /** True with probability `p`. */
  chance(p: number): boolean;
  /** Roughly normal (Box–Muller, Marsaglia's polar form), default mean 0 and standard deviation 1. */
  normal(mean?: number, sd?: number): number;
  /** Exponential with the given mean (inverse of the distribution function). */
  exponential(mean: number): number;
  /** One item, each equally likely. */
  pick<T>(items: readonly T[]): T;
}

/** mulberry32 by Tommy Ettinger (public domain): one 32-bit word of state, passes the usual smoke tests. */
function mulberry32(seedWord: number): () => number {
  let state = seedWord >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Neighbouring seeds (1, 2, 3 …) should give unrelated streams, so the seed is scrambled first (murmur3 finaliser). */
function scrambleSeed(seed: number): number {
  let h = (seed ^ 0x9e3779b9) >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return (h ^ (h >>> 16)) >>> 0;
}

/**
 * A new stream from an integer seed. Seeds are taken modulo 2^32, so 0 and 2^32 give the same stream.
 * @throws RangeError when the seed is not a whole number.
 */
export function createRandom(seed: number): Random {
  if (!Number.isSafeInteger(seed)) {
    throw new RangeError(`Random seed must be a whole number, got ${String(seed)}.`);
  }
  const seedWord = ((seed % 4294967296) + 4294967296) % 4294967296; // seed mod 2^32, exact for safe integers
  const next = mulberry32(scrambleSeed(seedWord));
  // The polar method makes two independent values per round; keep the second for the next call.
  let spareNormal: number | undefined;

  function standardNormal(): number {
    if (spareNormal !== undefined) {
      const value = spareNormal;
      spareNormal = undefined;
      return value;
    }
    let u: number;
    let v: number;
    let s: number;
    do {
      u = 2 * next() - 1;
      v = 2 * next() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const factor = Math.sqrt((-2 * deterministicLog(s)) / s);
    spareNormal = v * factor;
    return u * factor;
  }

  return {
    next,
    int(min, max) {
      if (!Number.isSafeInteger(min) || !Number.isSafeInteger(max) || max < min) {
        throw new RangeError(`int(min, max) needs whole numbers with min <= max, got ${min} and ${max}.`);
      }
      return min + Math.floor(next() * (max - min + 1));
    },
    chance: (p) => next() < p,
    normal: (mean = 0, sd = 1) => mean + sd * standardNormal(),
    // 1 − next() lies in (0, 1], so the logarithm is always defined.
    exponential: (mean) => -mean * deterministicLog(1 - next()),
    pick<T>(items: readonly T[]): T {
      if (items.length === 0) throw new RangeError('pick() needs at least one item.');
      return items[Math.floor(next() * items.length)] as T;
    },
  };
}

/** Chooses among fixed items with fixed weights; the set-up is done once, each choice is a binary search. */
export interface WeightedPicker<T> {
  pick(random: Random): T;
  /** Each item's share of the total weight, in the order given. */
  readonly shares: readonly number[];
}

/**
 * A picker for `items` where item i is chosen with probability weights[i] / sum(weights).
 * @throws RangeError on mismatched lengths, no items, or a negative, non-finite or all-zero weight.
 */
export function weightedPicker<T>(items: readonly T[], weights: readonly number[]): WeightedPicker<T> {
  if (items.length === 0 || items.length !== weights.length) {
    throw new RangeError(`weightedPicker needs one weight per item (${items.length} items, ${weights.length} weights).`);
  }
  const cumulative = new Float64Array(weights.length);
  let total = 0;
  weights.forEach((weight, index) => {
    if (!(weight >= 0) || !Number.isFinite(weight)) {
      throw new RangeError(`Weight ${index} must be a finite number >= 0, got ${weight}.`);
    }
    total += weight;
    cumulative[index] = total;
  });
  if (total === 0) throw new RangeError('weightedPicker needs at least one weight above 0.');

  return {
    shares: weights.map((weight) => weight / total),
    pick(random) {
      const target = random.next() * total;
      // First index whose running total exceeds the target; zero-weight items are never chosen.
      let low = 0;
      let high = cumulative.length - 1;
      while (low < high) {
        const middle = (low + high) >>> 1;
        if ((cumulative[middle] as number) > target) high = middle;
        else low = middle + 1;
      }
      return items[low] as T;
    },
  };
}

/**
 * Zipf weights 1/rank for ranks 1..count: a few levels are common, most are rare. The exponent is fixed at 1 on
 * purpose: a fractional power would need Math.pow, which engines may round differently (see the file comment).
 */
export function zipfWeights(count: number): number[] {
  return Array.from({ length: count }, (_, index) => 1 / (index + 1));
}

const LN2 = 0.6931471805599453;

/**
 * Natural logarithm using only +, −, ×, ÷ (see the file comment for why not Math.log). Accurate to about 1e-15
 * relative; enough for drawing random numbers, not meant as a general replacement.
 * @throws RangeError for x <= 0, NaN or Infinity.
 */
export function deterministicLog(x: number): number {
  if (!(x > 0) || !Number.isFinite(x)) throw new RangeError(`deterministicLog needs a finite x > 0, got ${x}.`);
  // x = m · 2^exponent with m in [√½, √2): halving and doubling are exact.
  let m = x;
  let exponent = 0;
  while (m >= Math.SQRT2) {
    m /= 2;
    exponent += 1;
  }
  while (m < Math.SQRT1_2) {
    m *= 2;
    exponent -= 1;
  }
  // ln m = 2·atanh(s) = 2(s + s³/3 + s⁵/5 + …) with |s| <= 0.172, so 13 terms reach double precision.
  const s = (m - 1) / (m + 1);
  const s2 = s * s;
  let power = s;
  let sum = s;
  for (let k = 3; k <= 27; k += 2) {
    power *= s2;
    sum += power / k;
  }
  return 2 * sum + exponent * LN2;
}
