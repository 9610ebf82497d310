/**
 * Right ascension and declination written back as astronomers read them (hh:mm:ss.ss, ±dd:mm:ss.s):
 * the server's formatters and the client's tables share this one rounding rule (a rounded 60
 * seconds carries). The parsers are the sky engine's (server/science/sky/coordinates.ts). Imports
 * nothing.
 */

/** Split |x| into whole units, whole minutes and seconds rounded to `digits`, carrying a rounded 60. */
function sexagesimal(x: number, digits: number): [number, number, string] {
  const scale = 10 ** digits;
  const totalSeconds = Math.round(Math.abs(x) * 3600 * scale) / scale;
  let whole = Math.floor(totalSeconds / 3600);
  let minutes = Math.floor((totalSeconds - whole * 3600) / 60);
  let seconds = totalSeconds - whole * 3600 - minutes * 60;
  if (seconds < 0) seconds = 0;
  let text = seconds.toFixed(digits);
  if (Number(text) >= 60) {
    text = (0).toFixed(digits);
    minutes += 1;
  }
  if (minutes >= 60) {
    minutes -= 60;
    whole += 1;
  }
  return [whole, minutes, text];
}

const pad2 = (n: number) => String(n).padStart(2, '0');
const padSeconds = (s: string) => (s.indexOf('.') === 1 || s.length === 1 ? `0${s}` : s);

/** Right ascension (degrees) as `hh:mm:ss.s…` hours, seconds to `digits` decimals. */
export function formatRaHms(raDeg: number, digits = 2): string {
  let [h, m, s] = sexagesimal(raDeg / 15, digits);
  if (h >= 24) h -= 24;
  return `${pad2(h)}:${pad2(m)}:${padSeconds(s)}`;
}

/** Declination (degrees) as `±dd:mm:ss.s…`, seconds to `digits` decimals; the sign always shown. */
export function formatDecDms(decDeg: number, digits = 1): string {
  const [d, m, s] = sexagesimal(decDeg, digits);
  const zero = d === 0 && m === 0 && Number(s) === 0;
  const sign = decDeg < 0 && !zero ? '-' : '+';
  return `${sign}${pad2(d)}:${pad2(m)}:${padSeconds(s)}`;
}
