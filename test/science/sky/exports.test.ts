/** The sky engine's public surface is pinned: a change to it is a decision, not an accident. */
import { expect, it } from 'vitest';
import * as sky from '../../../server/science/sky/index.ts';

it('exports exactly these values', () => {
  expect(Object.keys(sky).sort()).toEqual(
    [
      'AIRMASS_FORMULAS',
      'DEFAULT_HIGHEST_AIRMASS',
      'altitudeGrid',
      'DEFAULT_LEAST_MOON_DISTANCE_DEG',
      'DEFAULT_SUN_AVOIDANCE_DEG',
      'LIMITS',
      'NIGHT_CURVE_STEP',
      'NIGHT_STEP',
      'SEASON_STEP',
      'TWILIGHT_SUN_ALTITUDE_DEG',
      'ZONE_LONGITUDE_TOLERANCE_HOURS',
      'airmass',
      'checkTimeZone',
      'longitudeZoneMismatch',
      'nearestZones',
      'parseLatitude',
      'parseLongitude',
      'cautions',
      'altitudeForAirmass',
      'apparentAltitudeDeg',
      'astroTime',
      'darknessExact',
      'darknessFast',
      'deltaTSeconds',
      'exactSampler',
      'fastSampler',
      'findWindows',
      'formatDecDms',
      'formatRaHms',
      'frameTarget',
      'icrsDirection',
      'instant',
      'maskAltitudeDeg',
      'moonNight',
      'nightFrame',
      'nightOf',
      'nightReport',
      'nightSpan',
      'offsetPosition',
      'parallacticAngleRad',
      'parseDeclination',
      'parseNightDate',
      'parseRightAscension',
      'LOWEST_CHECKED_ALTITUDE_DEG',
      'refractionConstants',
      'refractionDeg',
      'refractionModel',
      'refractionWords',
      'siteRefraction',
      'seasonMap',
      'reviveSite',
      'seasonReport',
      'seeingAtAirmass',
      'skyPlaceExact',
      'skyPlaceOfDate',
      'standardAtmosphere',
      'sunNight',
      'taiMinusUtcS',
      'targetPositionAt',
      'trueAltitudeDeg',
      'validateLimits',
      'validateSite',
      'WAVELENGTH_SOURCES',
      'validateTarget',
    ].sort(),
  );
});

it('keeps the science layer free of http, store and client imports', async () => {
  const { readdirSync, readFileSync } = await import('node:fs');
  const dir = new URL('../../../server/science/sky/', import.meta.url);
  for (const f of readdirSync(dir)) {
    const src = readFileSync(new URL(f, dir), 'utf8');
    expect(src, f).not.toMatch(/from '\.\.\/\.\.\/(http|store|cli)\//);
    expect(src, f).not.toMatch(/from '.*client\//);
  }
});
