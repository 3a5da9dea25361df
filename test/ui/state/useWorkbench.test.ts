import { describe, expect, it } from 'vitest';
import { spellingChange } from '../../../src/ui/state/useWorkbench.ts';

describe('a change of missing spellings in words (the notice after it, with its Undo)', () => {
  it('names what is read as a value now and what as missing', () => {
    expect(spellingChange(['NA', 'None'], ['NA'])).toBe('“None” is read as a value now');
    expect(spellingChange(['NA'], ['NA', '-999'])).toBe('“-999” is read as missing now');
    expect(spellingChange(['NA', 'None', '?'], ['NA', '-999', 'unknown'])).toBe('“None”, “?” are read as values; “-999”, “unknown” are read as missing now');
    expect(spellingChange(['NA'], ['NA'])).toBe('The missing spellings were read again');
  });
});
