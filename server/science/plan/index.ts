/** Planning: flags, the season plan and the night schedule. Pure functions over the orbit and sky engines. */
export { LASER_GUIDE_STAR_CAUTION, PLAN_ADVISORY } from './cautions.ts';
export {
  BLOCK_KINDS,
  checkCandidates,
  type CandidateInput,
  type BlockKind,
} from './candidates.ts';
export {
  FLAG_KINDS,
  computeFlags,
  hoursAround,
  type Flag,
  type FlagKind,
  type FlagOptions,
  type FlagTarget,
  type SiteHours,
} from './flags.ts';
export { nightGrid, targetGrid, REASON_CODES, type NightGrid, type TargetGrid } from './grid.ts';
export { nightMoments, skyAtMoment, type MomentSky } from './moment.ts';
export { rounded } from './words.ts';
export {
  addInformation,
  informationModel,
  jacobians,
  posteriorCovariance,
  uncertainties,
  varianceReduction,
  type InformationModel,
  type Precision,
  type Uncertainties,
} from './information.ts';
export {
  AUTO_EXACT_ITEMS,
  SCHEDULE_METHODS,
  scheduleNight,
  scheduleOnGrid,
  type LeftOutBlock,
  type NightSchedule,
  type ScheduleMethod,
  type ScheduleOptions,
  type ScheduleRequest,
  type ScheduledBlock,
  type KeptBlock,
} from './night-schedule.ts';
export { SEASON_SETTINGS } from './season-types.ts';
export { nightCandidates } from './night-candidates.ts';
export {
  DETECTION_THRESHOLDS,
  FORECAST_FACTORS,
  forecastDetection,
  type DetectionForecast,
  type FactorForecast,
  type ForecastEpoch,
  type ForecastRequest,
} from './forecast.ts';
export {
  planSeason,
  type EpochGain,
  type NightNote,
  type PassagePlan,
  type PeriapsisRepeat,
  type PlannedEpoch,
  type SeasonOptions,
  type SeasonPlan,
  type SeasonSite,
  type SeasonTarget,
  type TargetPlan,
  type UnmetGoal,
} from './season-plan.ts';
export {
  NIGHT_REASONS,
  closingLimit,
  nightReasonWords,
  type NightReason,
  type NightReasonDetail,
} from './night-reasons.ts';
export { coverageProbability, passagesIn, type Passage } from './passage.ts';
export {
  DEFAULT_PRECISION,
  SEEING_AIRMASS_EXPONENT,
  precisionAt,
  precisionModel,
  type PrecisionModel,
} from './precision.ts';
export {
  EXACT_MAX_ITEMS,
  solveExact,
  solveGreedy,
  totalValue,
  type Placement,
  type SolverItem,
  type SolverProblem,
} from './solver.ts';
