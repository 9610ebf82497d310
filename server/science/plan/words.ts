/**
 * Numbers in the words of flags and plans: rounded to three significant figures (a derived
 * quantity of an orbit is rarely known better than a few parts in a thousand), never in exponent
 * form, so "239.862 km/s" reads "240 km/s" and "0.4437 mas" reads "0.444 mas".
 */

/** `x` to `digits` significant figures as plain decimal text ("240", "0.444", "27.9"). */
export function rounded(x: number, digits = 3): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return '0';
  const magnitude = Math.floor(Math.log10(Math.abs(Number(x.toPrecision(digits)))));
  return Number(x.toPrecision(digits)).toFixed(Math.max(0, digits - 1 - magnitude));
}
