/** Numbers on screen: powers of ten written as people write them, never the exponent form. */
import { describe, expect, test } from 'vitest';
import { scaledText } from '../../client/src/lib/numbers.ts';

describe('scaledText', () => {
  test('plain digits where the precision supports them', () => {
    expect(scaledText(2.3)).toBe('2.30');
    expect(scaledText(412.4)).toBe('412');
    expect(scaledText(0.00412)).toBe('0.00412');
    expect(scaledText(0)).toBe('0.00');
  });
  test('powers of ten beyond, with superscript exponents and a true minus', () => {
    expect(scaledText(2e7)).toBe('2.00 × 10⁷');
    expect(scaledText(123456)).toBe('1.23 × 10⁵');
    expect(scaledText(-4.1e12)).toBe('-4.10 × 10¹²');
    expect(scaledText(3.2e-5)).toBe('3.20 × 10⁻⁵');
    expect(scaledText(Number.NaN)).toBe('–');
  });
});
