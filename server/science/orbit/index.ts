/** The orbit engine's public surface (pinned by test/science/orbit/exports.test.ts). */
export type {
  CampbellInput,
  ThieleInnesInput,
  ElementsInput,
  OrbitInput,
  Orbit,
  RelativitySwitches,
  CovarianceInput,
  CovarianceParameter,
} from './types.ts';
export { COVARIANCE_PARAMETERS, THIELE_INNES_PARAMETERS } from './types.ts';
export { campbellCovariance, thieleInnesJacobian } from './thiele-innes-covariance.ts';
export {
  validateOrbit,
  campbellToThieleInnes,
  thieleInnesToCampbell,
  toCampbellInput,
  toThieleInnesInput,
  getParameter,
  withParameter,
} from './elements.ts';
export {
  solveKepler,
  solveKeplerBatch,
  trueAnomalyFromEccentric,
  eccentricFromTrueAnomaly,
} from './kepler.ts';
export {
  predict,
  predictBatch,
  PREDICTION_FIELDS,
  type Prediction,
  type PredictionColumns,
  type PredictionField,
} from './predict.ts';
export {
  findEvents,
  findEventLoci,
  relocateEvent,
  nextPeriapsis,
  EVENT_KINDS,
  type EventKind,
  type OrbitEvent,
  type EventOptions,
} from './events.ts';
export { describeOrbit } from './describe.ts';
export {
  physicalQuantities,
  massSolar,
  semiMajorAxisAu,
  type PhysicalQuantities,
} from './physical.ts';
export {
  schwarzschildRadiusM,
  precessionPerOrbitRad,
  gravitationalRedshiftKmS,
  transverseDopplerKmS,
  romerDelayDays,
} from './relativity.ts';
export {
  linearSigma,
  parameterJacobian,
  drawOrbits,
  percentiles,
  PERCENTILES,
  type MonteCarloOptions,
} from './uncertainty.ts';
export {
  ephemeris,
  eventsWithUncertainty,
  UNCERTAIN_FIELDS,
  type EphemerisRow,
  type EventWithUncertainty,
  type UncertaintyOptions,
} from './ephemeris.ts';
