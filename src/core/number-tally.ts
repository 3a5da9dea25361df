/**
 * Numbers counted by value: the profile's way to the distinct numbers of a column and how many
 * cells hold each, without sorting a million cells. Columns of measurements hold far fewer distinct
 * numbers than cells (a million amounts in cents: ~50,000 distinct), and only those get sorted.
 *
 * An open-addressing hash table with linear probing, each slot a number and its count side by side
 * in one Float64Array, so a probe touches one cache line. It starts small and doubles at half full:
 * a column of a dozen distinct numbers stays in the fastest cache, where a table sized for the
 * worst case (a slot per eight cells) took a cache miss per cell.
 *
 * -0 and 0 are counted as one number, as a sort leaves them side by side and the profile's runs
 * join them; the run is -0 when any -0 was counted (a sort puts it first, and the run takes the
 * first value's sign). NaN is never counted (callers count numbers that were read).
 */

/** The first table: 1,024 slots, 16 KB. */
const FIRST_SLOTS = 1 << 10;

/** A number's bits, seen as two 32-bit halves, for hashing. */
const bits = new Float64Array(1);
const halves = new Int32Array(bits.buffer);

/** A number's two 32-bit halves mixed so that every bit reaches the low bits a slot is taken from. */
function slotHash(value: number): number {
  bits[0] = value;
  const h = Math.imul(halves[0]!, 0x9e3779b1) ^ Math.imul(halves[1]!, 0x85ebca6b);
  return h ^ (h >>> 15);
}

export class NumberTally {
  /** Per slot: [number, count]; a count of 0 marks a free slot. */
  private table = new Float64Array(2 * FIRST_SLOTS);
  private mask = FIRST_SLOTS - 1;
  /** The distinct numbers in the order they were first counted. */
  private numbers = new Float64Array(FIRST_SLOTS >> 1);
  /** firstRows[i]: the row given when numbers[i] was first counted. */
  private firstRows = new Int32Array(FIRST_SLOTS >> 1);
  private size = 0;
  private negativeZero = false;

  /** Distinct numbers counted (-0 and 0 being one). */
  get distinct(): number {
    return this.size;
  }

  /** Counts `value` `count` times; `row` is kept as its first row when it is new. */
  add(value: number, count: number, row = 0): void {
    if (value === 0) {
      if (Object.is(value, -0)) this.negativeZero = true;
      value = 0; // -0 hashes apart from 0
    }
    const table = this.table;
    const mask = this.mask;
    for (let slot = slotHash(value) & mask; ; slot = (slot + 1) & mask) {
      const at = 2 * slot;
      if (table[at + 1] === 0) {
        this.insert(at, value, count, row);
        return;
      }
      if (table[at] === value) {
        table[at + 1]! += count;
        return;
      }
    }
  }

  /** How many times `value` was counted. */
  countOf(value: number): number {
    if (value === 0) value = 0;
    const table = this.table;
    for (let slot = slotHash(value) & this.mask; ; slot = (slot + 1) & this.mask) {
      const at = 2 * slot;
      if (table[at + 1] === 0) return 0;
      if (table[at] === value) return table[at + 1]!;
    }
  }

  /** Calls `visit` for each distinct number in the order first counted, with its count and first row. */
  forEach(visit: (value: number, count: number, firstRow: number) => void): void {
    for (let i = 0; i < this.size; i++) {
      const value = this.valueAt(i);
      visit(value, this.countOf(value), this.firstRows[i]!);
    }
  }

  /** The distinct numbers ascending with their counts (`sort` puts a Float64Array in ascending order). */
  runs(sort: (values: Float64Array) => Float64Array): { values: Float64Array; counts: Float64Array; length: number } {
    const values = sort(this.numbers.slice(0, this.size));
    const counts = new Float64Array(values.length);
    for (let i = 0; i < values.length; i++) counts[i] = this.countOf(values[i]!);
    if (this.negativeZero) for (let i = 0; i < values.length; i++) if (values[i] === 0) values[i] = -0;
    return { values, counts, length: values.length };
  }

  /** The i-th distinct number first counted, -0 when the run of zeros is -0's. */
  private valueAt(i: number): number {
    const value = this.numbers[i]!;
    return value === 0 && this.negativeZero ? -0 : value;
  }

  private insert(at: number, value: number, count: number, row: number): void {
    this.table[at] = value;
    this.table[at + 1] = count;
    if (this.size === this.numbers.length) {
      this.numbers = grown(this.numbers, 2 * this.size);
      this.firstRows = grown(this.firstRows, 2 * this.size);
    }
    this.numbers[this.size] = value;
    this.firstRows[this.size] = row;
    this.size++;
    if (2 * this.size > this.mask + 1) this.rehash(2 * (this.mask + 1));
  }

  /** A table of `slots` slots holding what this one holds. */
  private rehash(slots: number): void {
    const old = this.table;
    const table = new Float64Array(2 * slots);
    const mask = slots - 1;
    for (let at = 0; at < old.length; at += 2) {
      if (old[at + 1] === 0) continue;
      let slot = slotHash(old[at]!) & mask;
      while (table[2 * slot + 1] !== 0) slot = (slot + 1) & mask;
      table[2 * slot] = old[at]!;
      table[2 * slot + 1] = old[at + 1]!;
    }
    this.table = table;
    this.mask = mask;
  }
}

function grown<A extends Float64Array | Int32Array>(array: A, length: number): A {
  const next = new (array.constructor as new (length: number) => A)(length);
  next.set(array);
  return next;
}
