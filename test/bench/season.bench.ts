/**
 * Sky-engine benchmarks.
 *
 * season: a season map for 10,000 targets × 365 nights at one site, darkness sampled every 5 min,
 * on the fast path (per-night tables, closed-form counts). Baseline: the exact path
 * (astronomy-engine per instant: aberration, precession-nutation, Horizon) timed on a random
 * subsample of the same target-instants and scaled per evaluation. Only the target's own place is
 * counted for the baseline (a Sun/Moon shared by all targets at an instant is left out), which
 * favours the baseline.
 *
 * night-windows: one night's windows for 20 targets, fast path against the exact path.
 */
import {
  darknessFast,
  icrsDirection,
  nightFrame,
  nightReport,
  nightSpan,
  seasonMap,
  skyPlaceExact,
  validateLimits,
  validateSite,
  validateTarget,
  type Target,
} from '../../server/science/sky/index.ts';
import { SeededRandom } from '../../server/science/random.ts';
import { benchLine, bestOfPair, isMain } from './timing.ts';

// Invented demo site.
const site = validateSite({
  name: 'Loma Serena',
  latitudeDeg: -24.6,
  longitudeDeg: -70.4,
  elevationM: 2600,
  timeZone: 'America/Santiago',
});

function randomTargets(n: number, rng: SeededRandom): Target[] {
  return Array.from({ length: n }, (_, i) =>
    validateTarget({
      name: `t${i}`,
      raDeg: 360 * rng.uniform(),
      decDeg: (Math.asin(2 * rng.uniform() - 1) * 180) / Math.PI,
      pmRaMasYr: 50 * (rng.uniform() - 0.5),
      pmDecMasYr: 50 * (rng.uniform() - 0.5),
    }),
  );
}

export async function run(): Promise<string[]> {
  const rng = new SeededRandom(2027);
  const targets = randomTargets(10_000, rng);
  const c = validateLimits({}, site);
  seasonMap(site, 2027, targets.slice(0, 300), c); // JIT warm-up on a small map
  // Exact per instant on a random subsample of (target, night, dark instant).
  const picks: { target: Target; jd: number }[] = [];
  while (picks.length < 3000) {
    const date = new Date(Date.UTC(2027, 0, 1 + Math.floor(rng.uniform() * 365)))
      .toISOString()
      .slice(0, 10);
    const span = nightSpan(site, date);
    const dark = darknessFast(nightFrame(site, span, 0), c.sunLimitDeg)[0];
    if (!dark) continue;
    for (let k = 0; k < 30; k++)
      picks.push({
        target: targets[Math.floor(rng.uniform() * targets.length)]!,
        jd: dark.startJd + rng.uniform() * (dark.endJd - dark.startJd),
      });
  }
  let evaluations = 0;
  let sink = 0;
  const { ours: fast, baseline: exactSubsample } = bestOfPair(
    2,
    () => {
      evaluations = seasonMap(site, 2027, targets, c).evaluations;
    },
    () => {
      for (const p of picks)
        sink += skyPlaceExact(icrsDirection(p.target, p.jd), p.jd, site).altitudeDeg;
    },
  );
  if (!Number.isFinite(sink)) throw new Error('exact path gave a non-finite altitude');
  const exactScaled = (exactSubsample / picks.length) * evaluations;
  const lines = [benchLine('season', fast, 's', exactScaled / fast, 'exact-per-instant')];

  const few = targets.slice(0, 20);
  nightReport(site, '2027-06-14', few, c, { curveStepMinutes: 0 }); // warm-up
  const { ours: fastNight, baseline: exactNight } = bestOfPair(
    3,
    () => nightReport(site, '2027-06-15', few, c, { curveStepMinutes: 0 }),
    () => nightReport(site, '2027-06-15', few, c, { method: 'exact', curveStepMinutes: 0 }),
  );
  lines.push(
    benchLine('night-windows', fastNight * 1000, 'ms', exactNight / fastNight, 'exact-per-instant'),
  );
  return lines;
}

if (isMain(import.meta.url)) {
  for (const l of await run()) console.log(l);
}
