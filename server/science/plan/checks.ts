/** Small guards shared by the planners' input checks. */
import { InputError, requireFinite } from '../errors.ts';

/** A finite number in [lo, hi]. @throws InputError naming the field. */
export function numberIn(field: string, value: unknown, lo: number, hi: number): number {
  const x = requireFinite(field, value);
  if (x < lo || x > hi) throw new InputError(field, value, `must lie in [${lo}, ${hi}]`);
  return x;
}

/** A positive number up to hi. */
export function positive(field: string, value: unknown, hi: number): number {
  const x = requireFinite(field, value);
  if (!(x > 0 && x <= hi)) throw new InputError(field, value, `must lie in (0, ${hi}]`);
  return x;
}
