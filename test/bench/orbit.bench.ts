/**
 * Orbit-engine benchmarks: the Kepler solver against a plain Newton iteration, and batch predictions
 * against a loop over the scalar path. Both baselines run in this process on the same inputs.
 */
import {
  predict,
  predictBatch,
  solveKeplerBatch,
  validateOrbit,
} from '../../server/science/orbit/index.ts';
import { SeededRandom } from '../../server/science/random.ts';
import { benchLine, bestOfPair, isMain } from './timing.ts';

/** Plain Newton from E0 = M until |ΔE| < 1e-15 (capped, since it may not converge for e → 1). */
function newtonPlain(M: Float64Array, e: Float64Array, out: Float64Array): void {
  for (let i = 0; i < M.length; i++) {
    const m = M[i]!,
      ei = e[i]!;
    let E = m;
    for (let it = 0; it < 500; it++) {
      const dE = (E - ei * Math.sin(E) - m) / (1 - ei * Math.cos(E));
      E -= dE;
      if (Math.abs(dE) < 1e-15) break;
    }
    out[i] = E;
  }
}

export async function run(): Promise<string[]> {
  const n = 1_000_000;
  const rng = new SeededRandom(42);
  const M = Float64Array.from({ length: n }, () => (rng.uniform() * 2 - 1) * Math.PI);
  const e = Float64Array.from({ length: n }, () => rng.uniform() * 0.999);
  const out = new Float64Array(n);
  const k = bestOfPair(
    7,
    () => solveKeplerBatch(M, e, out),
    () => newtonPlain(M, e, out),
  );
  const lines = [
    benchLine('kepler', (k.ours / n) * 1e9, 'ns', k.baseline / k.ours, 'newton-plain'),
  ];

  // A star around a compact object (invented demo elements), with and without light time: with it,
  // every epoch needs its own fixed point, so the batch path gains less.
  const elements = {
    periodYears: 11.3,
    periapsis: '2031-02-11T00:00:00Z',
    eccentricity: 0.83,
    semiMajorAxisArcsec: 0.118,
    inclinationDeg: 47,
    ascendingNodeDeg: 318,
    argPeriapsisDeg: 152,
  };
  const jd = Float64Array.from({ length: n }, (_, i) => 2461000 + i * 0.01);
  for (const [name, orbit] of [
    [
      'ephemeris',
      validateOrbit({
        elements,
        distancePc: 15_000,
        relativity: { gravitationalRedshift: true, transverseDoppler: true, precession: true },
      }),
    ],
    [
      'ephemeris-light-time',
      validateOrbit({
        elements,
        distancePc: 15_000,
        relativity: {
          romer: true,
          gravitationalRedshift: true,
          transverseDoppler: true,
          precession: true,
        },
      }),
    ],
  ] as const) {
    const t = bestOfPair(
      3,
      () => predictBatch(orbit, jd),
      () => {
        for (let i = 0; i < n; i++) predict(orbit, jd[i]!);
      },
    );
    lines.push(benchLine(name, n / t.ours, 'pred/s', t.baseline / t.ours, 'scalar-loop'));
  }
  return lines;
}

if (isMain(import.meta.url)) for (const l of await run()) console.log(l);
