/**
 * A front for the CSV writer's number pieces (csv-write.ts NumberPieces). A continuous column's
 * written numbers are mostly the file's numbers — readings, cents: whole, or a few decimals —
 * moved and scaled. Taken back to the file's units and counted in steps of 1, 0.1, 0.01 or 0.001,
 * each number gives a slot in an array over the range the first batch spans, and the slot keeps
 * the number last seen there with its piece. A hit saves the hash lookup, which for the ~85,000
 * distinct numbers of a column of the benchmark's file misses the processor's cache on nearly
 * every row; the grid's few hundred kilobytes stay in it.
 * Correct whatever the numbers: a slot answers only for the very number it holds (bit for bit,
 * −0 apart from 0); any other number, and one outside the range, goes to the hash.
 */

/** Numbers looked at to choose the step and the range. */
const SAMPLE = 4096;
/** The most slots a grid may have (each 12 bytes). */
const MOST_SLOTS = 1 << 20;
/** A number is on a step when it is this close to it, in steps (the way back to the file's units rounds). */
const ON_STEP = 1e-6;

export class NumberPieceGrid {
  private readonly center: number;
  private readonly scale: number;
  /** Steps per unit of the file: 1, 10, 100 or 1000. */
  private readonly steps: number;
  /** The step of slot 0. */
  private readonly low: number;
  private readonly numbers: Float64Array;
  private readonly pieces: Int32Array;

  private constructor(center: number, scale: number, steps: number, low: number, slots: number) {
    this.center = center;
    this.scale = scale;
    this.steps = steps;
    this.low = low;
    this.numbers = new Float64Array(slots).fill(NaN);
    this.pieces = new Int32Array(slots);
  }

  /**
   * A grid for a column written as (x − center) ÷ scale, fitted to its first batch's numbers (those
   * not missing); null when they are not whole in any of the steps, or span too many slots.
   */
  static fit(values: Float64Array, missing: Uint8Array, rows: number, center: number, scale: number): NumberPieceGrid | null {
    const sample: number[] = [];
    for (let r = 0; r < rows && sample.length < SAMPLE; r++) {
      const raw = values[r]! * scale + center;
      if (missing[r] === 0 && Number.isFinite(raw)) sample.push(raw);
    }
    if (sample.length === 0) return null;
    for (const steps of [1, 10, 100, 1000]) {
      if (!sample.every((raw) => Math.abs(raw * steps - Math.round(raw * steps)) <= ON_STEP)) continue;
      let low = Infinity;
      let high = -Infinity;
      for (const raw of sample) {
        const key = Math.round(raw * steps);
        if (key < low) low = key;
        if (key > high) high = key;
      }
      // Room on both sides for the numbers later batches bring.
      const margin = Math.ceil((high - low + 1) / 2);
      const slots = high - low + 1 + 2 * margin;
      return slots > MOST_SLOTS ? null : new NumberPieceGrid(center, scale, steps, low - margin, slots);
    }
    return null;
  }

  /** The slot of a written number, or −1 when it lies outside the grid (or is not a number). */
  slotOf(value: number): number {
    const slot = Math.round((value * this.scale + this.center) * this.steps) - this.low;
    return slot >= 0 && slot < this.numbers.length ? slot : -1;
  }

  /** The piece kept in `slot` for exactly `value`, or −1. */
  pieceIn(slot: number, value: number): number {
    const held = this.numbers[slot]!;
    return held === value && (value !== 0 || Object.is(held, value)) ? this.pieces[slot]! : -1;
  }

  keep(slot: number, value: number, piece: number): void {
    this.numbers[slot] = value;
    this.pieces[slot] = piece;
  }

  /** Forgets every slot (the pieces they name are gone). */
  clear(): void {
    this.numbers.fill(NaN);
  }
}
