/**
 * The orbit CSV layout carries the uncertainty: a σ column per parameter and a correlations cell.
 * An imported row's stored covariance is C_ii = σ_i², C_ij = ρ_ij σ_i σ_j (constructed case), the
 * engine's covariance parameters are the layout's, and bad σ or ρ cells are named by column.
 */
import { describe, expect, it } from 'vitest';
import {
  COVARIANCE_TERMS,
  covarianceOf,
  sigmasOf,
  type CovarianceTerm,
} from '../../descriptors/covariance.ts';
import { thieleInnesJacobian, thieleInnesToCampbell } from '../../server/science/orbit/index.ts';
import { COVARIANCE_PARAMETERS } from '../../server/science/orbit/types.ts';
import { COLUMNS, LOCAL_OPERATOR, orbitsCsv } from '../../server/store/index.ts';
import { BACKENDS, ORBIT_WREN, fixture } from './backends.ts';

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

  it('a Thiele–Innes row takes σ of A, B, F, G, stored carried to a, i, Ω, ω', async () => {
    const env = await BACKENDS[1]!.open();
    try {
      await fixture(env.store);
      // Constructed case: a visual binary's constants with σ as published, A and F correlated.
      const csv =
        'system,target,kind,periodYears,periapsis,eccentricity,aArcsec,bArcsec,fArcsec,gArcsec,sigmaPeriodYears,sigmaAArcsec,sigmaBArcsec,sigmaFArcsec,sigmaGArcsec,correlations\n' +
        'Test Deep,Wren,thiele-innes,9.5,2028-02-01T00:00:00Z,0.6,0.05,-0.02,0.03,0.04,0.05,0.002,0.002,0.003,0.0025,aArcsec/fArcsec=-0.3\n';
      const report = await env.store.importCsv(LOCAL_OPERATOR, 'orbits', csv);
      expect(report.problems).toEqual([]);
      const stored = (await env.store.orbitSolutions.list({}, { limit: 50 })).items.find(
        (x) => x.provenance === 'imported',
      )!;
      const ti = { A: 0.05, B: -0.02, F: 0.03, G: 0.04 };
      const J = thieleInnesJacobian({ ti, campbell: thieleInnesToCampbell(ti) });
      const sigma = [0.002, 0.002, 0.003, 0.0025];
      const rho = (i: number, j: number) =>
        i === j ? 1 : (i === 0 && j === 2) || (i === 2 && j === 0) ? -0.3 : 0;
      const C = sigma.map((si, i) => sigma.map((sj, j) => rho(i, j) * si * sj));
      const cov = stored.orbit.covariance!;
      expect(cov.parameters).toEqual([
        'periodYears',
        'semiMajorAxisArcsec',
        'inclinationDeg',
        'ascendingNodeDeg',
        'argPeriapsisDeg',
      ]);
      expect(cov.matrix[0]![0]).toBeCloseTo(0.0025, 15);
      for (let r = 0; r < 4; r++)
        for (let c = 0; c < 4; c++) {
          let x = 0;
          for (let a = 0; a < 4; a++)
            for (let b = 0; b < 4; b++) x += J[r]![a]! * C[a]![b]! * J[c]![b]!;
          expect(cov.matrix[1 + r]![1 + c]).toBeCloseTo(x, 12);
        }
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

describe('orbit CSV export', () => {
  it('round-trips elements, σ, correlations and relativity through the import', async () => {
    // Constructed case: a Campbell solution with four correlated σ, a Thiele–Innes one with
    // relativity switched on and scaled; exported, then imported into a second store.
    const cov = covarianceOf(
      { periodYears: 0.03, periapsisDays: 4.5, eccentricity: 0.002, semiMajorAxisArcsec: 0.0007 },
      [
        { a: 'periodYears', b: 'periapsisDays', rho: 0.41 },
        { a: 'eccentricity', b: 'semiMajorAxisArcsec', rho: -0.27 },
      ],
    ) as { parameters: CovarianceTerm[]; matrix: number[][] };
    const solutions = [
      {
        ...ORBIT_WREN,
        massRatio: 0.35,
        lightFraction: 0.2,
        covariance: cov,
      },
      {
        elements: {
          kind: 'thiele-innes' as const,
          periodYears: 9.5,
          periapsis: '2028-02-01T00:00:00Z',
          eccentricity: 0.6,
          aArcsec: 0.05,
          bArcsec: -0.02,
          fArcsec: 0.03,
          gArcsec: 0.04,
        },
        distancePc: 11500,
        relativity: { gravitationalRedshift: true, precession: true },
        relativityFactors: { redshiftFactor: 0.8, precessionFactor: 1.25 },
      },
    ];
    // A fit's covariance with a parameter held fixed (variance 0, as stored fits keep it).
    const held = {
      parameters: ['periodYears', 'distancePc'] as CovarianceTerm[],
      matrix: [
        [0.01, 0],
        [0, 0],
      ],
    };
    solutions.push({ ...ORBIT_WREN, covariance: held } as (typeof solutions)[number]);
    const [from, into] = [await BACKENDS[1]!.open(), await BACKENDS[1]!.open()];
    try {
      await fixture(from.store);
      await fixture(into.store);
      const wren = (await from.store.targets.list({}, { limit: 5 })).items[0]!;
      for (const orbit of solutions)
        await from.store.orbitSolutions.create(LOCAL_OPERATOR, {
          targetId: wren.id,
          orbit,
          reference: '=constructed',
        });
      const csv = orbitsCsv(await from.store.exports.orbits({ targetId: wren.id }));
      expect(csv.split('\n')[0]).toBe(COLUMNS.orbits.join(','));
      expect(csv).toContain("'=constructed"); // a formula-like cell stays text in a spreadsheet
      const before = await into.store.orbitSolutions.list({}, { limit: 50 });
      const report = await into.store.importCsv(LOCAL_OPERATOR, 'orbits', csv);
      expect(report.problems).toEqual([]);
      const after = (await into.store.orbitSolutions.list({}, { limit: 50 })).items.slice(
        before.items.length,
      );
      expect(after.map((s) => s.reference)).toEqual([
        '',
        '=constructed',
        '=constructed',
        '=constructed',
      ]);
      const [campbell, thiele] = [after[1]!.orbit, after[2]!.orbit];
      // The held parameter comes back without a σ: the same orbit, no uncertainty on d.
      expect(after[3]!.orbit.covariance!.parameters).toEqual(['periodYears']);
      expect(after[3]!.orbit.covariance!.matrix[0]![0]).toBeCloseTo(0.01, 15);
      expect(campbell.elements).toEqual({ kind: 'campbell', ...solutions[0]!.elements });
      expect([campbell.massRatio, campbell.lightFraction]).toEqual([0.35, 0.2]);
      expect(campbell.covariance!.parameters).toEqual(cov.parameters);
      const worst = Math.max(
        ...cov.matrix.flatMap((row, i) =>
          row.map((x, j) => Math.abs(campbell.covariance!.matrix[i]![j]! - x) / (Math.abs(x) || 1)),
        ),
      );
      expect(worst).toBeLessThan(1e-11); // ρ written to 12 digits
      const { sigmas, correlations } = sigmasOf(campbell.covariance!);
      expect(sigmas.periapsisDays).toBeCloseTo(4.5, 12);
      expect(correlations.map((c) => [c.a, c.b, Number(c.rho.toFixed(12))])).toEqual([
        ['periodYears', 'periapsisDays', 0.41],
        ['eccentricity', 'semiMajorAxisArcsec', -0.27],
      ]);
      expect(thiele).toMatchObject({
        elements: solutions[1]!.elements,
        relativity: solutions[1]!.relativity,
        relativityFactors: solutions[1]!.relativityFactors,
      });
      expect(thiele.covariance).toBeUndefined();
      // The current version stays the current one.
      expect(after.map((s) => s.current)).toEqual([false, false, false, true]);
    } finally {
      from.cleanup();
      into.cleanup();
    }
  });
});
