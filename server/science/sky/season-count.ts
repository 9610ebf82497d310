/**
 * The season map's inner loop: how many samples of a night's dark grid a target spends above an
 * altitude limit, in closed form. With H(t_k) = H_s + k·ΔH the hour angle at sample k and H₀ the
 * hour angle at which the target crosses the limit, the target is up at sample k exactly when
 * H(t_k) ∈ [2πm − H₀, 2πm + H₀] for some integer m: an integer count per m, no sampling.
 */
import { TWO_PI } from '../constants.ts';

/**
 * Number of k in [0, n) with Hs + k·dH within ±H0 of a multiple of 2π.
 * @param cosH0 cosine of the limit's hour angle: ≥ 1 never up, ≤ −1 always up
 */
export function countUp(hsRad: number, dhRad: number, n: number, cosH0: number): number {
  if (n <= 0 || cosH0 >= 1) return 0;
  if (cosH0 <= -1) return n;
  const h0 = Math.acos(cosH0);
  const last = hsRad + (n - 1) * dhRad;
  const mLo = Math.floor((hsRad - h0) / TWO_PI);
  const mHi = Math.ceil((last + h0) / TWO_PI);
  let count = 0;
  for (let m = mLo; m <= mHi; m++) {
    const c = m * TWO_PI;
    let kLo = Math.ceil((c - h0 - hsRad) / dhRad);
    let kHi = Math.floor((c + h0 - hsRad) / dhRad);
    if (kLo < 0) kLo = 0;
    if (kHi > n - 1) kHi = n - 1;
    if (kHi >= kLo) count += kHi - kLo + 1;
  }
  return count;
}

/** cos H₀ for a declination (sin, cos) and the geometric altitude limit's sine at a latitude (sin, cos). */
export function cosLimitHourAngle(
  sinDec: number,
  cosDec: number,
  sinLat: number,
  cosLat: number,
  sinLimit: number,
): number {
  const den = cosLat * cosDec;
  if (den <= 1e-12) {
    // At a pole or for a target at a pole the altitude does not change: up all the time or never.
    return sinLat * sinDec >= sinLimit ? -1 : 1;
  }
  return (sinLimit - sinLat * sinDec) / den;
}
