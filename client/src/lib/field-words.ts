/**
 * Request field names (startUtc, targetId, outcomes.0.exposureMinutes) read as the labels people
 * see on screen, for the server's refusals: no code name reaches the screen.
 */
import { RELATIVITY_WORDS } from './numbers.ts';

/** Labels of the request fields that reach the screen in a refusal. */
export const FIELD_WORDS: Record<string, string> = {
  startUtc: 'start',
  endUtc: 'end',
  targetId: 'target',
  nightId: 'night',
  siteId: 'site',
  campaignId: 'campaign',
  systemId: 'system',
  blockId: 'block',
  raDeg: 'RA',
  decDeg: 'Dec',
  pmRaMasYr: 'μα*',
  pmDecMasYr: 'μδ',
  distancePc: 'distance',
  massSolar: 'mass',
  latitudeDeg: 'latitude',
  altitudeDeg: 'altitude',
  horizonMask: 'horizon mask point',
  azimuthDeg: 'azimuth',
  longitudeDeg: 'longitude',
  elevationM: 'elevation',
  timeZone: 'time zone',
  lowestAltitudeDeg: 'lowest altitude',
  leastSunDistanceDeg: 'least Sun distance',
  leastMoonDistanceDeg: 'least Moon distance',
  highestAirmass: 'highest airmass',
  laserGuideStar: 'laser guide star',
  seeingArcsec: 'seeing',
  strehlRatio: 'Strehl ratio',
  cloudCoverPct: 'cloud cover',
  humidityPct: 'humidity',
  windMS: 'wind speed',
  temperatureC: 'temperature',
  timeLostHours: 'time lost',
  timeLostReason: 'why time was lost',
  exposureMinutes: 'exposure',
  outcomes: 'outcome',
  positionEpoch: 'position epoch',
  periodYears: 'P',
  periapsis: 'T',
  eccentricity: 'e',
  semiMajorAxisArcsec: 'a',
  inclinationDeg: 'i',
  ascendingNodeDeg: 'Ω',
  argPeriapsisDeg: 'ω',
  covariance: 'covariance',
  aArcsec: 'A',
  bArcsec: 'B',
  fArcsec: 'F',
  gArcsec: 'G',
  systemicVelocityKmS: 'γ',
  offsetRaMas: 'frame offset in Δα*',
  offsetDecMas: 'frame offset in Δδ',
  driftRaMasYr: 'frame drift in Δα*',
  driftDecMasYr: 'frame drift in Δδ',
  periapsisDays: 'T',
  periapsisJd: 'T',
  nextPeriapsisJd: 'next periapsis',
  semiMajorAxisAu: 'a in au',
  periapsisAu: 'periapsis distance',
  periapsisSchwarzschildRadii: 'periapsis distance in Schwarzschild radii',
  semiAmplitudeKmS: 'K',
  massRatio: 'q',
  lightFraction: 'β',
  relativity: 'relativity',
  relativityFactors: 'relativity factors',
  redshiftFactor: 'redshift factor',
  precessionFactor: 'precession factor',
  ...RELATIVITY_WORDS,
  makeCurrent: 'make current',
  clearFraction: 'clear fraction',
  strengthNights: 'worth (nights)',
  months: 'month',
  month: 'month',
  startDate: 'first night',
  endDate: 'last night',
  cadenceDays: 'cadence',
  goals: 'goals',
  limits: 'limits',
  elements: 'elements',
  orbit: 'orbit',
  text: 'file',
  '(body)': 'the request',
};

/**
 * A dotted request path in words: "outcomes.0.exposureMinutes" → "outcome 1, exposure". `items`
 * names the entries of a list the form sent ("months.0" → "January" when the first month sent was
 * January), so a refusal reads as the field the person typed into.
 */
export function fieldWords(
  path: string,
  items: Record<string, (index: number) => string | undefined> = {},
): string {
  const parts = path.split('.');
  const out: string[] = [];
  parts.forEach((p, k) => {
    const list = parts[k - 1];
    if (/^\d+$/.test(p)) {
      const named = list === undefined ? undefined : items[list]?.(Number(p));
      const n = Number(p) + 1;
      if (named !== undefined && out.length) out[out.length - 1] = named;
      else if (out.length) out[out.length - 1] = `${out[out.length - 1]} ${n}`;
      else out.push(`item ${n}`);
    } else out.push(FIELD_WORDS[p] ?? p);
  });
  return out.join(', ');
}

/** Replace request field names inside a rule's text by their labels ("with endUtc must…" → "with end must…"). */
export function ruleWords(rule: string): string {
  return rule.replace(/\b[a-z]+[A-Z][A-Za-z]*\b/g, (w) => FIELD_WORDS[w] ?? w);
}
