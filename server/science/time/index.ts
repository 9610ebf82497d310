export {
  parseEpoch,
  formatEpoch,
  jdToIso,
  jdToMjd,
  jdToUnixMs,
  unixMsToJd,
  julianEpochToJd,
  jdToJulianEpoch,
  besselianEpochToJd,
  jdToBesselianEpoch,
  type EpochFormat,
} from './epoch.ts';
export {
  parseDurationDays,
  parseDurationMinutes,
  formatDuration,
  type DurationRule,
  epochRange,
  resolveEpochs,
  MAX_EPOCHS,
  type EpochsInput,
} from './duration.ts';
