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
