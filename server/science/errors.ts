/** One broken rule: the dotted field, the value as given, the rule in words. */
export interface FieldProblem {
  field: string;
  value: unknown;
  rule: string;
}

/**
 * The one error type the science layer throws for bad input. It names the field, the value and the
 * rule that was broken, so every interface (HTTP, CLI) can show it as it is.
 */
export class InputError extends Error {
  override readonly name = 'InputError';
  constructor(
    /** Path of the offending field, dotted (e.g. `elements.eccentricity`). */
    readonly field: string,
    /** The value as given. */
    readonly value: unknown,
    /** The rule it broke, in words (e.g. `must satisfy 0 ≤ e < 1`). */
    readonly rule: string,
    /** Every problem found when a whole record was checked at once (the first is the one above). */
    readonly problems: readonly FieldProblem[] = [],
  ) {
    super(`${field}: ${describeValue(value)} ${rule}`);
  }
}

/** Thrown when a computation has no meaningful answer for valid input (e.g. a search that cannot converge). */
export class ComputationError extends Error {
  override readonly name = 'ComputationError';
}

function describeValue(value: unknown): string {
  if (typeof value === 'string') return JSON.stringify(value);
  if (value === undefined) return '(missing)';
  try {
    const s = JSON.stringify(value);
    return s === undefined ? String(value) : s.length > 80 ? `${s.slice(0, 77)}...` : s;
  } catch {
    return String(value);
  }
}

/** Guard: a finite number, or throw naming the field. */
export function requireFinite(field: string, value: unknown): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new InputError(field, value, 'must be a finite number');
  }
  return value;
}

/**
 * A decimal comma is refused, never dropped: `1,5` must not become 15. The rule names the value
 * with a decimal point, as the fix.
 */
export function refuseDecimalComma(s: string, field: string, value: unknown): void {
  if (!s.includes(',')) return;
  const fix = /^[^,]*\d,\d[^,]*$/.test(s) ? s.replace(',', '.') : '1.5';
  throw new InputError(field, value, `has a comma: use a decimal point: ${fix}`);
}
