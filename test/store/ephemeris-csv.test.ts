/** The ephemeris CSV carries the linear 1σ of each quantity beside it when the orbit has a covariance. */
import { parse } from 'csv-parse/sync';
import { expect, it } from 'vitest';
import { ephemeris, validateOrbit } from '../../server/science/orbit/index.ts';
import { ephemerisCsv } from '../../server/store/index.ts';
import { ORBIT_WREN } from './backends.ts';

it('writes sigma columns equal to the ephemeris σ, and none without a covariance', () => {
  // constructed case: ORBIT_WREN (invented) with a diagonal covariance of its own choosing
  const withCov = validateOrbit({
    ...ORBIT_WREN,
    covariance: {
      parameters: ['periodYears', 'eccentricity', 'semiMajorAxisArcsec'],
      matrix: [
        [0.01, 0, 0],
        [0, 1e-6, 0],
        [0, 0, 1e-8],
      ],
    },
  });
  const jd = Float64Array.from([2461300.5, 2461400.5, 2461500.5]);
  const rows = ephemeris(withCov, jd);
  const table = parse(ephemerisCsv(rows), { columns: true }) as Record<string, string>[];
  expect(Object.keys(table[0]!)).toEqual(
    expect.arrayContaining([
      'sigmaDRaMas',
      'sigmaDDecMas',
      'sigmaSeparationMas',
      'sigmaPositionAngleDeg',
    ]),
  );
  rows.forEach((r, i) => {
    expect(Number(table[i]!.sigmaDRaMas)).toBe(r.sigma!.dRaMas); // the same number, written in full
    expect(Number(table[i]!.sigmaPositionAngleDeg)).toBe(r.sigma!.positionAngleDeg);
    expect(r.sigma!.dRaMas).toBeGreaterThan(0);
  });
  const bare = ephemerisCsv(ephemeris(validateOrbit(ORBIT_WREN), jd));
  expect(bare.split('\n')[0]).not.toMatch(/sigma/);
});
