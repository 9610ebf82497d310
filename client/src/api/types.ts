/** The shapes the client reads from the HTTP API (units as in the server's schemas). */
export type Role = 'lead' | 'observer' | 'viewer';
export interface Me {
  id: number;
  name: string;
  role: Role;
}
export interface SystemRow {
  id: number;
  name: string;
  raDeg: number;
  decDeg: number;
  pmRaMasYr: number;
  pmDecMasYr: number /** epoch of raDeg/decDeg, ISO 8601 UTC */;
  positionEpoch: string;
  distancePc: number | null;
  massSolar: number | null;
  notes: string;
}
export interface TargetRow {
  id: number;
  systemId: number;
  name: string;
  magnitude: number | null;
  band: string | null;
  notes: string;
}
export interface HorizonPoint {
  azimuthDeg: number;
  altitudeDeg: number;
}
export interface SiteRow {
  id: number;
  name: string;
  latitudeDeg: number;
  longitudeDeg: number;
  elevationM: number;
  timeZone: string;
  lowestAltitudeDeg: number;
  leastSunDistanceDeg: number;
  pressureHpa: number | null;
  temperatureC: number | null;
  horizonMask: HorizonPoint[];
  laserGuideStar: boolean;
  notes: string;
}
export interface CampaignRow {
  id: number;
  name: string;
  startDate: string;
  endDate: string;
  targetIds: number[];
  siteIds: number[];
  notes: string;
  goals: { cadenceDays: number; kinds: string[] };
  limits: { highestAirmass?: number; leastMoonDistanceDeg?: number; darkness?: string };
}
export interface NightRow {
  id: number;
  siteId: number;
  campaignId: number | null;
  date: string;
  notes: string;
}
export type BlockStatus = 'planned' | 'obtained' | 'partial' | 'lost' | 'skipped';
export interface BlockRow {
  id: number;
  nightId: number;
  targetId: number;
  kind: 'astrometry' | 'spectroscopy';
  startUtc: string;
  endUtc: string;
  status: string;
  laserGuideStar: boolean;
  notes: string;
  version: number;
  origin: BlockOrigin;
  pinned: boolean;
}
/** Where a stored block came from; the server sets it and no client can change it. */
export type BlockOrigin = 'season-plan' | 'night-schedule' | 'by-hand';
export interface Outcome {
  blockId: number;
  status: string;
  exposureMinutes: number | null;
  notes: string;
}
export interface ReportRow {
  id: number;
  nightId: number;
  seeingArcsec: number | null;
  strehlRatio: number | null;
  cloudCoverPct: number | null;
  humidityPct: number | null;
  windMS: number | null;
  temperatureC: number | null;
  timeLostHours: number;
  timeLostReason: string;
  notes: string;
  version: number;
  updatedAt?: string;
  outcomes: Outcome[];
}
export interface MeasurementRow {
  id: number;
  targetId: number;
  blockId: number | null;
  kind: 'offsets' | 'separation' | 'radial-velocity';
  epoch: string;
  dRaMas: number | null;
  dDecMas: number | null;
  sigmaDRaMas: number | null;
  sigmaDDecMas: number | null;
  separationMas: number | null;
  positionAngleDeg: number | null;
  sigmaSeparationMas: number | null;
  sigmaPositionAngleDeg: number | null;
  correlation: number | null;
  radialVelocityKmS: number | null;
  sigmaRadialVelocityKmS: number | null;
  instrument: string;
  notes: string;
}
export interface SolutionRow {
  id: number;
  targetId: number;
  version: number;
  current: boolean;
  orbit: {
    elements: Record<string, unknown>;
    distancePc?: number;
    systemicVelocityKmS?: number;
    relativity?: Record<string, boolean>;
    covariance?: unknown;
  };
  provenance: string;
  fittedFrom: number[] | null;
  reference: string;
  notes: string;
  createdAt: string;
}
export interface Prediction {
  epoch: string;
  jd: number;
  dRaMas: number;
  dDecMas: number;
  separationMas: number;
  positionAngleDeg: number;
  radialVelocityKmS: number;
  keplerianRvKmS?: number;
  gravitationalRedshiftKmS?: number;
  transverseDopplerKmS?: number;
  trueAnomalyDeg: number;
}
export interface Ephemeris {
  solution: { id: number; version: number };
  orbit: { physical?: Record<string, number>; relativity?: Record<string, boolean> };
  predictions: Prediction[];
}
export interface OrbitEvent {
  kind: string;
  epoch: string;
  jd: number;
  orbitNumber: number;
  sigmaDays?: number;
  state?: Prediction;
}
export interface Stamp {
  utc: string;
  local: string;
}
export interface Interval {
  start: Stamp;
  end: Stamp;
  hours: number;
}
/** What opens or closes a target's window (the sky engine's names). */
export type Limit =
  | 'darkness'
  | 'altitude'
  | 'horizon-mask'
  | 'sun-distance'
  | 'moon'
  | 'night-edge';
export interface Window extends Interval {
  opensBy: Limit;
  closesBy: Limit;
  best?: { utc: string; altitudeDeg: number; airmass: number };
}
/** Sampled every few minutes; `horizonMaskDeg` (the mask's altitude at the target's azimuth, °) only with a horizon mask. */
export interface Curve {
  utc: string[];
  altitudeDeg: number[];
  azimuthDeg: number[];
  airmass: (number | null)[];
  moonSeparationDeg: number[];
  horizonMaskDeg?: number[];
  /** The limit that closes the target at each sample (the windows' rule); null where it is open. */
  closedBy: (Limit | null)[];
}
export interface VisTarget {
  name: string;
  /** Apparent place of date at the night's middle, degrees. */
  raOfDateDeg: number;
  decOfDateDeg: number;
  observableHours: number;
  moonSeparationDeg: number;
  sunSeparationDeg: number;
  windows: Window[];
  curve: Curve | null;
}
export interface Visibility {
  nightId: number;
  site: { name: string; timeZone: string };
  night: { date: string; start: Stamp; end: Stamp };
  sun: {
    set: Stamp | null;
    rise: Stamp | null;
    twilights: Record<
      'civil' | 'nautical' | 'astronomical',
      { dusk: Stamp | null; dawn: Stamp | null }
    >;
  };
  darkness: { limit: string; intervals: Interval[]; hours: number };
  /** `curve`: the Moon's topocentric altitude (centre, no refraction, °) on the targets' instants, when curves were asked for. */
  moon: {
    rise: Stamp | null;
    set: Stamp | null;
    illuminatedFraction: number;
    curve?: { utc: string[]; altitudeDeg: number[] } | null;
  };
  limits: {
    altitudeLimitDeg: number;
    highestAirmass?: number | null;
    airmassFormula?: string;
    leastMoonDistanceDeg?: number;
    leastSunDistanceDeg: number;
    horizonMask?: boolean;
  };
  targets: VisTarget[];
  cautions: string[];
}
export interface SeasonTarget {
  name: string;
  season: {
    start: string;
    end: string;
    usableNights: number;
    bestNight: string;
    bestHours: number;
  } | null;
  periapses: { epoch?: string; date?: string; inSeason?: boolean }[];
  hoursPerNight: number[];
}
export interface Season {
  year: number;
  nights: { date: string; darkHours: number }[];
  targets: SeasonTarget[];
  cautions?: string[];
}
export interface Page<T> {
  items: T[];
  total: number;
}

/** GET /targets/{id}/forecast: when the relativity factors become detectable with the planned blocks. */
export interface FactorForecast {
  name: 'redshiftFactor' | 'precessionFactor';
  assumedValue: number;
  sigmaNow: number | null;
  sigmaAfter: number | null;
  significanceNow: number;
  significanceAfter: number;
  reaches: { sigma: number; already: boolean; epoch: string | null }[];
  topEpochs: { epoch: string; kind: 'astrometry' | 'spectroscopy'; share: number }[];
}
export interface TargetForecast {
  factors: FactorForecast[];
  plannedEpochs: number;
  summary: string[];
  assumptions: string;
  solution: { id: number; version: number };
  at: string;
  precision: { astrometryMas: number; spectroscopyKmS: number; source: string };
  blockIds: number[];
}
