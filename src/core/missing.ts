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

/** Decimal number text as number storage reads it ("12", "-0.5", "1.50", "1e3"). */
const DECIMAL = /^-?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * The numbers some missing-value token spells ("-999", "0", "0.00"). Number storage keeps most
 * cells as numbers without their text (columns-builder.ts), so whatever reads number storage by
 * value must look at the text of a cell holding one of these (cellText) and test that, or a coded
 * missing value would be read as a number.
 */
export function missingNumbers(tokens: readonly string[]): ReadonlySet<number> {
  const numbers = new Set<number>();
  for (const token of tokens) {
    const t = token.trim();
    if (DECIMAL.test(t)) numbers.add(Number(t));
  }
  return numbers;
}
