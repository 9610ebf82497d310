/**
 * The sky engine: sites, targets, the Sun and the Moon, topocentric places (exact and fast),
 * airmass, nightly windows and season maps. Pure functions; the HTTP routes, the CLI, the tests
 * and the benchmark all call these.
 */
export { standardAtmosphere } from './atmosphere.ts';
export {
  AIRMASS_FORMULAS,
  airmass,
  altitudeForAirmass,
  seeingAtAirmass,
  type AirmassFormula,
} from './airmass.ts';
export {
  astroTime,
  parallacticAngleRad,
  skyPlaceExact,
  skyPlaceOfDate,
  type SkyPlace,
} from './apparent.ts';
export {
  DEFAULT_HIGHEST_AIRMASS,
  DEFAULT_LEAST_MOON_DISTANCE_DEG,
  validateLimits,
  type Limits,
  type LimitsInput,
} from './limits.ts';
export {
  formatDecDms,
  formatRaHms,
  parseDeclination,
  parseLatitude,
  parseLongitude,
  parseRightAscension,
} from './coordinates.ts';
export { darknessExact, darknessFast, type Interval } from './darkness.ts';
export { nightFrame, type NightFrame } from './frame.ts';
export {
  instant,
  nightOf,
  nightSpan,
  parseNightDate,
  type Instant,
  type NightSpan,
} from './night.ts';
export {
  cautions,
  NIGHT_CURVE_STEP,
  NIGHT_STEP,
  nightReport,
  type NightOptions,
  type NightReport,
  type ReportWindow,
  type TargetNight,
} from './night-report.ts';
export {
  apparentAltitudeDeg,
  LOWEST_CHECKED_ALTITUDE_DEG,
  refractionConstants,
  refractionDeg,
  refractionModel,
  siteRefraction,
  trueAltitudeDeg,
  type RefractionConditions,
  type RefractionModel,
} from './refraction.ts';
export {
  altitudeGrid,
  exactSampler,
  fastSampler,
  frameTarget,
  type FrameTarget,
  type Sampler,
  type SkySample,
} from './samplers.ts';
export {
  SEASON_STEP,
  seasonMap,
  type SeasonMap,
  type SeasonOptions,
  type TargetSeason,
} from './season.ts';
export { seasonReport } from './season-report.ts';
export type { PeriapsisInSeason, SeasonSummary } from './season-summary.ts';
export {
  DEFAULT_SUN_AVOIDANCE_DEG,
  maskAltitudeDeg,
  refractionWords,
  reviveSite,
  validateSite,
  WAVELENGTH_SOURCES,
  type HorizonPoint,
  type Site,
  type WavelengthSource,
  type SiteInput,
} from './site.ts';
export { TWILIGHT_SUN_ALTITUDE_DEG, moonNight, sunNight, type TwilightKind } from './sun-moon.ts';
export {
  icrsDirection,
  offsetPosition,
  targetPositionAt,
  validateTarget,
  type Target,
  type TargetInput,
} from './target.ts';
export { deltaTSeconds, taiMinusUtcS } from './time-scale.ts';
export { LIMITS, findWindows, type Limit } from './windows.ts';
export {
  ZONE_LONGITUDE_TOLERANCE_HOURS,
  checkTimeZone,
  longitudeZoneMismatch,
  nearestZones,
  type ZoneMismatch,
} from './zones.ts';
