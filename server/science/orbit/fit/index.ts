/** Orbit fitting: the public surface. */
export { fitOrbits } from './fit.ts';
export { FitRefusal, type RefusalReason } from './refusal.ts';
export { OUTLIER_SIGMA, type FitResult, type StarSolution } from './result.ts';
export type {
  FitRequest,
  StarInput,
  StarHints,
  StartInput,
  MeasurementInput,
  OffsetInput,
  SeparationInput,
  VelocityInput,
  PriorInput,
  SamplerOptions,
  FittedParameter,
  DerivedQuantity,
  Residual,
} from './types.ts';
