/**
 * Orbit-fit benchmarks. One star with 100 astrometric and 50 radial-velocity epochs, and a joint
 * fit of five stars; the baseline is the same fit whose Levenberg–Marquardt takes its derivatives
 * by central differences, run in this process on the same measurements. `fit` is the whole fit
 * (grid start, LM, covariance); `fit-lm` the LM stage alone from the grid's best start.
 * `fit-10k` and `fit-100k` are one star with that many measurements (two thirds astrometric) fitted
 * whole; their baseline is the same fit without the coarse start (every measurement in the grid
 * search and in every start's LM, solve.ts COARSE_EPOCHS), as fits ran before it.
 * The orbits are invented demo values.
 */
import { fitOrbits, type StarInput } from '../../server/science/orbit/fit/index.ts';
import { gridSearch } from '../../server/science/orbit/fit/grid.ts';
import { checkRequest } from '../../server/science/orbit/fit/request.ts';
import { assemble } from '../../server/science/orbit/fit/result.ts';
import {
  build,
  COARSE_EPOCHS,
  lmOn,
  solve,
  solveStar,
  startFromNode,
} from '../../server/science/orbit/fit/solve.ts';
import { SeededRandom } from '../../server/science/random.ts';
import { epochs, simulate } from '../science/orbit/fit/simulate.ts';
import { benchLine, bestOfPair, isMain } from './timing.ts';

const MASS = 2e7,
  DISTANCE = 15_000,
  J2012 = 2455927.5;

function star(
  name: string,
  periodYears: number,
  periapsis: string,
  e: number,
  i: number,
  node: number,
  arg: number,
  nAst: number,
  nRv: number,
  seed: number,
  jitterDays = 10,
): StarInput {
  const semiMajorAxisArcsec = Math.cbrt(MASS * periodYears ** 2) / DISTANCE;
  const truth = {
    elements: {
      periodYears,
      periapsis,
      eccentricity: e,
      semiMajorAxisArcsec,
      inclinationDeg: i,
      ascendingNodeDeg: node,
      argPeriapsisDeg: arg,
    },
    distancePc: DISTANCE,
    systemicVelocityKmS: 0,
  };
  const r = new SeededRandom(seed);
  const measurements = simulate(
    truth,
    {
      astrometryJd: epochs(J2012, 14 * 365.25, nAst, r, jitterDays),
      sigmaMas: 0.4,
      velocityJd: epochs(J2012 + 30, 13.5 * 365.25, nRv, r, jitterDays),
      sigmaRadialVelocityKmS: 12,
    },
    seed + 1,
  );
  return {
    name,
    measurements,
    hints: { periodYears: { min: periodYears * 0.85, max: periodYears * 1.2 } },
  };
}

/**
 * One star of n measurements, the whole fit as `fitOrbits` runs it (request check, solve, result
 * with every residual), with and without the coarse start (seconds, best of `runs`).
 */
function large(n: number, runs: number): { ours: number; baseline: number } {
  const nAst = Math.round((2 * n) / 3);
  const one = star('Brisa-9', 15, 'J2021.4', 0.9, 130, 225, 65, nAst, n - nAst, 31, 0.5);
  const whole = (coarseEpochs: number) => {
    const req = checkRequest({ stars: [one] });
    assemble(solveStar(req, req.stars[0]!, true, true, 'analytic', coarseEpochs), req, 'analytic');
  };
  return bestOfPair(
    runs,
    () => whole(COARSE_EPOCHS),
    () => whole(Infinity),
  );
}

export async function run(): Promise<string[]> {
  const single = { stars: [star('Brisa-1', 15, 'J2021.4', 0.9, 130, 225, 65, 100, 50, 11)] };
  const req = checkRequest(single);
  fitOrbits(single); // warm up
  const whole = bestOfPair(
    3,
    () => solve(req, 'analytic'),
    () => solve(req, 'finite-difference'),
  );
  const b = build(req, req.stars, true);
  const s0 = req.stars[0]!;
  const node = gridSearch(s0.obs, {
    periodDays: { min: 15 * 0.85 * 365.25, max: 15 * 1.2 * 365.25 },
    eccentricity: { min: 0, max: 0.97 },
    frameOffset: false,
    frameDrift: false,
    frameEpochJd: b.L.frameEpochJd,
    keep: 1,
  })[0]!;
  const lm = bestOfPair(
    5,
    () => lmOn(b, startFromNode(b, node), req, 'analytic'),
    () => lmOn(b, startFromNode(b, node), req, 'finite-difference'),
  );
  const five = {
    stars: [
      star('Brisa-1', 15, 'J2021.4', 0.9, 130, 225, 65, 40, 15, 21),
      star('Brisa-2', 11, 'J2016.2', 0.7, 60, 100, 300, 40, 15, 22),
      star('Brisa-3', 20, 'J2019.9', 0.5, 100, 310, 20, 40, 15, 23),
      star('Brisa-4', 9, 'J2023.1', 0.85, 35, 45, 150, 40, 15, 24),
      star('Brisa-5', 13, 'J2014.7', 0.95, 150, 180, 250, 40, 15, 25),
    ],
  };
  const reqJoint = checkRequest(five);
  solve(reqJoint); // warm up
  const joint = bestOfPair(
    2,
    () => solve(reqJoint, 'analytic'),
    () => solve(reqJoint, 'finite-difference'),
  );
  const tenK = large(10_000, 2);
  const hundredK = large(100_000, 1);
  return [
    benchLine('fit-10k', tenK.ours, 's', tenK.baseline / tenK.ours, 'full-search'),
    benchLine('fit-100k', hundredK.ours, 's', hundredK.baseline / hundredK.ours, 'full-search'),
    benchLine('fit', whole.ours * 1e3, 'ms', whole.baseline / whole.ours, 'finite-difference-lm'),
    benchLine('fit-lm', lm.ours * 1e3, 'ms', lm.baseline / lm.ours, 'finite-difference-lm'),
    benchLine(
      'fit-joint',
      joint.ours * 1e3,
      'ms',
      joint.baseline / joint.ours,
      'finite-difference-lm',
    ),
  ];
}

if (isMain(import.meta.url)) for (const l of await run()) console.log(l);
