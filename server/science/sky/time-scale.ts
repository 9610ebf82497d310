/**
 * UTC → TT for astronomy-engine. astronomy-engine reads its input instant as UT (which drives the
 * Earth's rotation, so hour angles do not depend on this) and derives TT = UT + ΔT, which places the
 * Sun, the Moon and the precession-nutation. Its default ΔT is a long-term polynomial that is about
 * 6 s off in 2026 (the Moon then lands ~3″ astray). Since 1972, TT − UTC is known exactly
 * (32.184 s + the leap seconds) and UT1 − UTC stays within ±0.9 s, so we take UT1 = UTC and
 * TT = UTC + 32.184 s + (TAI − UTC), as ERFA does with dut1 = 0. Before 1972 astronomy-engine's
 * model is kept. After the last entry we assume no new leap second (none is announced).
 */
import { DeltaT_EspenakMeeus, SetDeltaTFunction } from 'astronomy-engine';
import { JD_J2000, MJD_OFFSET } from '../constants.ts';

/** Start of each TAI − UTC step (MJD, UTC) and its value in seconds. IERS Bulletin C. */
const LEAP_SECONDS: readonly (readonly [mjd: number, taiMinusUtcS: number])[] = [
  [41317, 10],
  [41499, 11],
  [41683, 12],
  [42048, 13],
  [42413, 14],
  [42778, 15],
  [43144, 16],
  [43509, 17],
  [43874, 18],
  [44239, 19],
  [44786, 20],
  [45151, 21],
  [45516, 22],
  [46247, 23],
  [47161, 24],
  [47892, 25],
  [48257, 26],
  [48804, 27],
  [49169, 28],
  [49534, 29],
  [50083, 30],
  [50630, 31],
  [51179, 32],
  [53736, 33],
  [54832, 34],
  [56109, 35],
  [57204, 36],
  [57754, 37],
];

/** TT − TAI, seconds (exact by definition). */
export const TT_MINUS_TAI_S = 32.184;

/** TAI − UTC in seconds at a UTC Julian Date; null before 1972 (no integer leap seconds yet). */
export function taiMinusUtcS(jdUtc: number): number | null {
  const mjd = jdUtc - MJD_OFFSET;
  let value: number | null = null;
  for (const [start, s] of LEAP_SECONDS) {
    if (mjd >= start) value = s;
    else break;
  }
  return value;
}

/** TT − UT in seconds for astronomy-engine's `ut` (days since J2000, read as UTC). */
export function deltaTSeconds(ut: number): number {
  const dat = taiMinusUtcS(ut + JD_J2000);
  return dat === null ? DeltaT_EspenakMeeus(ut) : TT_MINUS_TAI_S + dat;
}

let installed = false;
/** Make astronomy-engine use `deltaTSeconds` (process-wide; idempotent). Called by every sky entry point. */
export function useLeapSecondTimeScale(): void {
  if (installed) return;
  SetDeltaTFunction(deltaTSeconds);
  installed = true;
}
