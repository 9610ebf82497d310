/**
 * The orbit CSV layout carries the uncertainty: a σ column per parameter and a correlations cell.
 * An imported row's stored covariance is C_ii = σ_i², C_ij = ρ_ij σ_i σ_j (constructed case), the
 * engine's covariance parameters are the layout's, and bad σ or ρ cells are named by column.
 */
import { describe, expect, it } from 'vitest';
import { COVARIANCE_TERMS, covarianceOf, sigmasOf } from '../../descriptors/covariance.ts';
import { COVARIANCE_PARAMETERS } from '../../server/science/orbit/types.ts';
import { LOCAL_OPERATOR } from '../../server/store/index.ts';
import { BACKENDS, fixture } from './backends.ts';

const HEADER =
  'system,target,periodYears,periapsis,eccentricity,semiMajorAxisArcsec,inclinationDeg,ascendingNodeDeg,argPeriapsisDeg,distancePc,sigmaPeriodYears,sigmaPeriapsisDays,sigmaEccentricity,correlations';

describe('orbit CSV with covariance columns', () => {
  it('names the same parameters as the orbit engine', () => {
    expect(COVARIANCE_TERMS.map((t) => t.parameter)).toEqual([...COVARIANCE_PARAMETERS]);
  });

  it('σ and ρ make the covariance, and read back from it', () => {
    const cov = covarianceOf({ periodYears: 0.02, eccentricity: 0.004, periapsisDays: 3 }, [
      { a: 'eccentricity', b: 'periapsisDays', rho: 0.5 },
    ]);
    expect(cov).toEqual({
      parameters: ['periodYears', 'periapsisDays', 'eccentricity'],
      matrix: [
        [0.0004, 0, 0],
        [0, 9, 0.5 * 3 * 0.004],
        [0, 0.5 * 3 * 0.004, 0.004 ** 2],
      ],
    });
    const back = sigmasOf(cov as { parameters: string[]; matrix: number[][] });
    expect(back.sigmas.periapsisDays).toBeCloseTo(3, 12);
    expect(back.correlations).toHaveLength(1);
    expect(back.correlations[0]!.rho).toBeCloseTo(0.5, 12);
  });

  it('an imported row stores its covariance; a bad cell is named by its column', async () => {
    const env = await BACKENDS[1]!.open();
    try {
      await fixture(env.store);
      const row = (extra: string) =>
        `${HEADER}\nTest Deep,Wren,14.2,2027-06-14T06:00:00Z,0.74,0.094,71,143,298,11500,${extra}\n`;
      const ok = await env.store.importCsv(
        LOCAL_OPERATOR,
        'orbits',
        row('0.02,3,0.004,eccentricity/periapsisDays=0.5'),
      );
      expect(ok.problems).toEqual([]);
      const stored = (await env.store.orbitSolutions.list({}, { limit: 50 })).items.find(
        (s) => s.provenance === 'imported',
      )!;
      expect(stored.orbit.covariance).toEqual({
        parameters: ['periodYears', 'periapsisDays', 'eccentricity'],
        matrix: [
          [0.0004, 0, 0],
          [0, 9, 0.006],
          [0, 0.006, 0.000016],
        ],
      });
      const bad = await env.store
        .importCsv(LOCAL_OPERATOR, 'orbits', row('0.02,3,-0.004,eccentricity/periapsisDays=1.5'), {
          allowDuplicates: true,
        })
        .catch((e: { report?: unknown }) => e.report ?? e);
      expect(JSON.stringify(bad)).toMatch(/sigmaEccentricity/);
      const worse = await env.store
        .importCsv(LOCAL_OPERATOR, 'orbits', row('0.02,3,0.004,eccentricity~periapsisDays'), {
          allowDuplicates: true,
        })
        .catch((e: { report?: unknown }) => e.report ?? e);
      expect(JSON.stringify(worse)).toMatch(/correlations/);
    } finally {
      env.cleanup();
    }
  });

  it('a row refused for one field is reported, never dropped while counted as written', async () => {
    const env = await BACKENDS[1]!.open();
    try {
      await fixture(env.store);
      const r = await env.store
        .importCsv(LOCAL_OPERATOR, 'targets', 'system,name\nNo Such Deep,T x\n')
        .catch((e: { report?: unknown }) => e.report ?? e);
      expect(r).toMatchObject({ written: 0, problems: [{ line: 2, column: 'system' }] });
    } finally {
      env.cleanup();
    }
  });
});
