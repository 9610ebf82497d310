import { describe, expect, it } from 'vitest';
import * as orbit from '../../../server/science/orbit/index.ts';
import * as time from '../../../server/science/time/index.ts';

// The public surface of the orbit engine and the epoch module is pinned: a change here is a decision.
describe('public surface', () => {
  it('orbit engine exports exactly these values', () => {
    expect(Object.keys(orbit).sort()).toEqual(
      [
        'COVARIANCE_PARAMETERS',
        'EVENT_KINDS',
        'PERCENTILES',
        'PREDICTION_FIELDS',
        'THIELE_INNES_PARAMETERS',
        'UNCERTAIN_FIELDS',
        'campbellCovariance',
        'campbellToThieleInnes',
        'drawOrbits',
        'eccentricFromTrueAnomaly',
        'describeOrbit',
        'ephemeris',
        'eventsWithUncertainty',
        'findEventLoci',
        'findEvents',
        'getParameter',
        'gravitationalRedshiftKmS',
        'linearSigma',
        'massSolar',
        'nextPeriapsis',
        'parameterJacobian',
        'percentiles',
        'physicalQuantities',
        'precessionPerOrbitRad',
        'predict',
        'predictBatch',
        'relocateEvent',
        'romerDelayDays',
        'schwarzschildRadiusM',
        'semiMajorAxisAu',
        'solveKepler',
        'solveKeplerBatch',
        'thieleInnesJacobian',
        'thieleInnesToCampbell',
        'toCampbellInput',
        'toThieleInnesInput',
        'transverseDopplerKmS',
        'trueAnomalyFromEccentric',
        'validateOrbit',
        'withParameter',
      ].sort(),
    );
  });

  it('epoch module exports exactly these values', () => {
    expect(Object.keys(time).sort()).toEqual(
      [
        'MAX_EPOCHS',
        'besselianEpochToJd',
        'epochRange',
        'formatDuration',
        'formatEpoch',
        'jdToBesselianEpoch',
        'jdToIso',
        'jdToJulianEpoch',
        'jdToMjd',
        'jdToUnixMs',
        'julianEpochToJd',
        'parseDurationDays',
        'parseDurationMinutes',
        'parseEpoch',
        'resolveEpochs',
        'unixMsToJd',
      ].sort(),
    );
  });
});
