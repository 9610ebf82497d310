import { describe, expect, it } from 'vitest';
import { InputError } from '../../server/science/errors.ts';
import { cellValue } from '../../server/store/csv/read.ts';

describe('CSV number cells', () => {
  it('refuses a decimal comma naming the fix, never reading 1,5 as 15', () => {
    // the rule is ours (README "Input forms"): a decimal comma is refused, not dropped
    try {
      cellValue('dRaMas', '1,5');
      expect.fail('accepted 1,5');
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).field).toBe('dRaMas');
      expect((e as InputError).rule).toMatch(/use a decimal point: 1\.5/);
    }
    expect(cellValue('dRaMas', '1.5')).toBe(1.5);
  });
});
