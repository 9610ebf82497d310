/**
 * The demo's first load (issue budget: under 2 s).
 *
 * demo-first-load: CPU time (user + system) of `startStore` loading the demo into a fresh store, in
 * a fresh process each run (test/bench/demo-load-child.ts), at an anchor a year after the day the
 * scenario was drawn up, where the Moon moves some blocks and the stars they measure are refit at
 * load. Baseline, alternating with it: the same first load at the designed day, where every kept
 * fit still holds and nothing is fitted. CPU time rather than wall time, since the machine is shared;
 * median of 5 each.
 *
 * demo-refit: in this process, the fits of the stars whose measurements moved at that anchor, each
 * one Levenberg–Marquardt run from its kept fit (`hints.startOnly`). Baseline: the same stars fitted
 * by the full search (grid and six LM starts), what the load did before.
 */
import { execFileSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { JULIAN_YEAR_DAYS } from '../../server/science/constants.ts';
import { demoSolutions, type FitStar } from '../../server/store/demo/fits.ts';
import { demoAnchor, DESIGNED_ON } from '../../server/store/demo/scenario.ts';
import { LOCAL_OPERATOR, createStore, openDatabase } from '../../server/store/index.ts';
import { benchLine, isMain } from './timing.ts';

const CHILD = fileURLToPath(new URL('./demo-load-child.ts', import.meta.url));
const RUNS = 5;
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

const designed = `${DESIGNED_ON}T12:00:00Z`;
const yearLater = new Date(Date.parse(designed) + JULIAN_YEAR_DAYS * 86_400_000).toISOString();

function firstLoad(now: string): { cpuMs: number; fittedAtLoad: number } {
  const out = execFileSync(process.execPath, ['--import', 'tsx', CHILD, now], {
    encoding: 'utf8',
    env: { ...process.env, EPOCHWRIGHT_NOW: now },
  });
  return JSON.parse(out.trim().split('\n').at(-1)!) as { cpuMs: number; fittedAtLoad: number };
}

/** Every demo star with its entered orbit and its measurements, loaded at `now`. */
async function demoStars(now: string): Promise<FitStar[]> {
  const database = await openDatabase({ url: ':memory:' });
  try {
    const store = createStore(database);
    await store.loadDemo(LOCAL_OPERATOR, { now });
    const stars: FitStar[] = [];
    for (const target of (await store.targets.list({}, { limit: 100 })).items) {
      const solutions = await store.orbitSolutions.list({ targetId: target.id }, { limit: 100 });
      const measurements = (
        await store.measurements.list({ targetId: target.id }, { limit: 1000 })
      ).items.sort((a, b) => a.id - b.id);
      stars.push({
        name: target.name,
        orbit: solutions.items.find((s) => s.provenance === 'entered')!.orbit,
        measurements,
      });
    }
    return stars;
  } finally {
    database.close();
  }
}

function ms(f: () => unknown): number {
  const t0 = process.hrtime.bigint();
  f();
  return Number(process.hrtime.bigint() - t0) / 1e6;
}

export async function run(): Promise<string[]> {
  const later: number[] = [];
  const base: number[] = [];
  let fitted = 0;
  for (let r = 0; r < RUNS; r++) {
    const a = firstLoad(yearLater);
    later.push(a.cpuMs);
    fitted = a.fittedAtLoad;
    base.push(firstLoad(designed).cpuMs);
  }
  const lines = [
    benchLine(
      `demo-first-load(${fitted}-refit)`,
      median(later),
      'ms-cpu',
      median(base) / median(later),
      'designed-day-load',
    ),
  ];

  // The stars refit at that anchor: those whose kept fit no longer holds.
  const stars = await demoStars(yearLater);
  const anchor = demoAnchor(yearLater);
  const atLoad = demoSolutions(stars, anchor, false).filter((f) =>
    f.reference.startsWith('demo fit at load'),
  );
  const moved = new Set(atLoad.flatMap((f) => f.solutions.map((s) => s.name)));
  const subset = stars.filter((s) => moved.has(s.name));
  let started = Infinity;
  let searched = Infinity;
  for (let r = 0; r < 3; r++) {
    started = Math.min(
      started,
      ms(() => demoSolutions(stars, anchor, false)),
    );
    searched = Math.min(
      searched,
      ms(() => demoSolutions(subset, anchor, true)),
    );
  }
  lines.push(
    benchLine(
      `demo-refit(${subset.length}-stars)`,
      started,
      'ms',
      searched / started,
      'full-search',
    ),
  );
  return lines;
}

if (isMain(import.meta.url)) for (const line of await run()) console.log(line);
