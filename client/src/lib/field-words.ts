/**
 * Request field names (startUtc, targetId, outcomes.0.exposureMinutes) read as the labels people
 * see on screen, for the server's refusals: no code name reaches the screen.
 */
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

/** A dotted request path in words: "outcomes.0.exposureMinutes" → "outcome 1, exposure". */
export function fieldWords(path: string): string {
  const parts = path.split('.');
  const out: string[] = [];
  for (const p of parts) {
    if (/^\d+$/.test(p)) {
      const n = Number(p) + 1;
      if (out.length) out[out.length - 1] = `${out[out.length - 1]} ${n}`;
      else out.push(`item ${n}`);
    } else out.push(FIELD_WORDS[p] ?? p);
  }
  return out.join(', ');
}

/** Replace request field names inside a rule's text by their labels ("with endUtc must…" → "with end must…"). */
export function ruleWords(rule: string): string {
  return rule.replace(/\b[a-z]+[A-Z][A-Za-z]*\b/g, (w) => FIELD_WORDS[w] ?? w);
}
