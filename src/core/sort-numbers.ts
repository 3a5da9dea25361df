/**
 * Sorting a million numbers, for the profile's median, histogram and distinct count. A radix sort
 * on the numbers' bits: four passes of 16 bits over the array, against the engine's
 * `Float64Array.prototype.sort`, which compares pairs (about four times slower on a million).
 *
 * Each double's 64 bits become an unsigned key that orders like the number: a positive number's
 * sign bit is set, a negative number's bits are all flipped. -0 then sorts before +0, as in
 * `Float64Array.prototype.sort`. NaN is not expected (callers sort numbers that were read).
 */

/** Below this many numbers the engine's sort is as fast. */
const SMALL = 4096;
const DIGIT_BITS = 16;
const BUCKETS = 1 << DIGIT_BITS;
const MASK = BUCKETS - 1;

/** Sorts `values` in place, ascending; returns it. */
export function sortNumbers(values: Float64Array): Float64Array {
  if (values.length < SMALL) return values.sort();
  // The same memory seen as 32-bit halves (little-endian, as on every platform we run on: low half first).
  const n = values.length;
  const halves = new Uint32Array(values.buffer, values.byteOffset, 2 * n);
  let low = new Uint32Array(n);
  let high = new Uint32Array(n);
  toKeys(halves, low, high);
  let spareLow = new Uint32Array(n);
  let spareHigh = new Uint32Array(n);
  const counts = digitCounts(low, high);
  for (let pass = 0; pass < 4; pass++) {
    const keys = pass < 2 ? low : high;
    const shift = (pass % 2) * DIGIT_BITS;
    const offset = pass * BUCKETS;
    // A digit all keys share moves nothing: skip the pass (the exponent's high bits, often).
    if (counts[offset + ((keys[0]! >>> shift) & MASK)] === n) continue;
    scatter(keys, shift, counts.subarray(offset, offset + BUCKETS), low, high, spareLow, spareHigh);
    [low, spareLow] = [spareLow, low];
    [high, spareHigh] = [spareHigh, high];
  }
  fromKeys(low, high, halves);
  return values;
}

// Each loop in a function of its own: the first sort in a process (a command line's only one)
// runs them before they are optimised, and a small function is optimised sooner and faster than
// one holding every loop.

/** Each double's bits as an unsigned key (low and high halves) that orders like the number. */
function toKeys(halves: Uint32Array, low: Uint32Array, high: Uint32Array): void {
  for (let i = 0; i < low.length; i++) {
    const lo = halves[2 * i]!;
    const hi = halves[2 * i + 1]!;
    const negative = hi >>> 31 === 1;
    low[i] = negative ? ~lo >>> 0 : lo;
    high[i] = negative ? ~hi >>> 0 : (hi | 0x80000000) >>> 0;
  }
}

/** The four digits' histograms, in one pass over the keys. */
function digitCounts(low: Uint32Array, high: Uint32Array): Uint32Array {
  const counts = new Uint32Array(4 * BUCKETS);
  for (let i = 0; i < low.length; i++) {
    const lo = low[i]!;
    const hi = high[i]!;
    counts[lo & MASK]! += 1;
    counts[BUCKETS + (lo >>> DIGIT_BITS)]! += 1;
    counts[2 * BUCKETS + (hi & MASK)]! += 1;
    counts[3 * BUCKETS + (hi >>> DIGIT_BITS)]! += 1;
  }
  return counts;
}

/** One pass: the keys moved to `toLow`/`toHigh` in order of their digit at `shift` (`counts`: that digit's histogram). */
function scatter(keys: Uint32Array, shift: number, counts: Uint32Array, low: Uint32Array, high: Uint32Array, toLow: Uint32Array, toHigh: Uint32Array): void {
  let total = 0;
  for (let d = 0; d < BUCKETS; d++) {
    const c = counts[d]!;
    counts[d] = total;
    total += c;
  }
  for (let i = 0; i < keys.length; i++) {
    const at = counts[(keys[i]! >>> shift) & MASK]!++;
    toLow[at] = low[i]!;
    toHigh[at] = high[i]!;
  }
}

/** The keys back into doubles. */
function fromKeys(low: Uint32Array, high: Uint32Array, halves: Uint32Array): void {
  for (let i = 0; i < low.length; i++) {
    const hi = high[i]!;
    const positive = hi >>> 31 === 1;
    halves[2 * i] = positive ? low[i]! : ~low[i]! >>> 0;
    halves[2 * i + 1] = positive ? (hi & 0x7fffffff) >>> 0 : ~hi >>> 0;
  }
}
