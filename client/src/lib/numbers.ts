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

const SUPERSCRIPT = '⁰¹²³⁴⁵⁶⁷⁸⁹';

/**
 * `significant` digits, in powers of ten (2.00 × 10⁷) where plain digits would need zeros the
 * precision does not support (from 10^significant up, and below 0.001); never the program's
 * exponent form (2.00e+7).
 */
export function scaledText(v: number, significant = 3): string {
  if (!Number.isFinite(v)) return '–';
  if (v === 0 || (Math.abs(v) >= 1e-3 && Math.abs(v) < 10 ** significant))
    return v.toPrecision(significant);
  const [mantissa, exp] = v.toExponential(significant - 1).split('e') as [string, string];
  const power = [...String(Math.abs(Number(exp)))].map((d) => SUPERSCRIPT[Number(d)]).join('');
  return `${mantissa} × 10${Number(exp) < 0 ? '⁻' : ''}${power}`;
}

/**
 * A relativity factor's 1σ to three significant digits: enough to tell two plans apart, never the
 * seven of fixed decimals on a large σ (1130, not 1133.293).
 */
export const factorSigmaText = (sigma: number) => valueText(sigma, null, 3);

/** Why a radial velocity is missing: without a distance the orbit's size in au, hence K, is unknown. */
export const RV_WHY = 'needs the solution’s distance (the orbit’s size in au)';

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
