/**
 * Numbers on screen, rounded to what they are worth: a value with a 1σ keeps the digits its σ
 * supports (σ to two significant digits, the value to the same place); one without keeps
 * `significant` digits. One place for the rule, so every view rounds alike.
 */

/** Decimal places that show a σ to two significant digits (0 when σ ≥ 10). */
export function placesFor(sigma: number): number {
  if (!(sigma > 0) || !Number.isFinite(sigma)) return 0;
  return Math.max(0, 1 - Math.floor(Math.log10(sigma)));
}

/** "14.23 ± 0.05" or, without σ, the value to `significant` digits; units are the caller's. */
export function valueText(v: number, sigma?: number | null, significant = 5): string {
  if (!Number.isFinite(v)) return '–';
  if (sigma !== null && sigma !== undefined && sigma > 0) {
    const p = placesFor(sigma);
    return `${v.toFixed(p)} ± ${sigma.toFixed(p)}`;
  }
  return Number(v.toPrecision(significant)).toString();
}

/** The relativistic terms in words. */
export const RELATIVITY_WORDS: Record<string, string> = {
  romer: 'light-travel time',
  gravitationalRedshift: 'gravitational redshift',
  transverseDoppler: 'transverse Doppler shift',
  precession: 'Schwarzschild precession',
};

/** Orbit events in words (the API's event kinds). */
export const EVENT_WORDS: Record<string, string> = {
  periapsis: 'periapsis',
  apoapsis: 'apoapsis',
  'ascending-node': 'ascending node (receding)',
  'descending-node': 'descending node',
  'rv-maximum': 'largest radial velocity',
  'rv-minimum': 'smallest radial velocity',
  'closest-separation': 'closest on the sky',
  'widest-separation': 'widest on the sky',
};
