/** Which cell texts mean "no value". */

/** A fast membership test for one recipe's or profile's missing-value tokens. */
export type MissingTest = (raw: string) => boolean;

/**
 * Missing means: empty after trimming, or equal (after trimming, case-sensitive) to one of the
 * tokens. Case matters on purpose: "NA" is a missing marker, "Na" may be sodium.
 */
export function missingTest(tokens: readonly string[]): MissingTest {
  const set = new Set(tokens);
  return (raw) => {
    const t = raw.trim();
    return t === '' || set.has(t);
  };
}

/**
 * The numbers whose plain text (`String(n)`) is a missing-value token ("-999", "0"). Number storage
 * keeps such cells as plain numbers without their text (columns-builder.ts), so whatever reads
 * number storage by value must test the value against these, or a coded missing value would be
 * read as a number.
 */
export function missingNumbers(tokens: readonly string[]): ReadonlySet<number> {
  const numbers = new Set<number>();
  for (const token of tokens) {
    const t = token.trim();
    const value = t === '' ? NaN : Number(t);
    if (!Number.isNaN(value) && String(value) === t) numbers.add(value);
  }
  return numbers;
}
