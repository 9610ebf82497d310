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
export { parseDurationDays, epochRange, MAX_EPOCHS } from './duration.ts';
