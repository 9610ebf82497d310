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
export { parseDurationDays } from './duration.ts';
