/**
 * Keeps the demo's fits in the repository: loads the demo scenario at the day it was drawn up for,
 * fits every star to its demo measurements (server/store/demo/fits.ts) and writes the solutions,
 * their periapsis counted from the anchor day, to server/store/demo/kept-fits.ts. Run
 * `npm run demo-fits` after changing the scenario; test/store/demo-fits.test.ts fails until then.
 */
import { execFileSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { fitDemo, type FitStar } from '../server/store/demo/fits.ts';
import { DESIGNED_ON, demoAnchor } from '../server/store/demo/scenario.ts';
import { LOCAL_OPERATOR, createStore, openDatabase } from '../server/store/index.ts';

const OUT = fileURLToPath(new URL('../server/store/demo/kept-fits.ts', import.meta.url));

const HEADER = `/**
 * Written by \`npm run demo-fits\` (tools/demo-fits.ts): do not edit by hand. The demo's fits to its
 * own measurements, periapsis in days from the anchor day's 0h UTC (server/store/demo/fits.ts).
 */
import type { KeptFits } from './fits.ts';

export const KEPT_FITS: KeptFits = `;

const now = `${DESIGNED_ON}T12:00:00Z`;
const anchor = demoAnchor(now);
const database = await openDatabase({ url: ':memory:' });
try {
  const store = createStore(database);
  await store.loadDemo(LOCAL_OPERATOR, { now, fitNow: true });
  const stars: FitStar[] = [];
  for (const target of (await store.targets.list({}, { limit: 100 })).items) {
    const solutions = await store.orbitSolutions.list({ targetId: target.id }, { limit: 100 });
    const entered = solutions.items.find((s) => s.provenance === 'entered')!;
    const measurements = (
      await store.measurements.list({ targetId: target.id }, { limit: 1000 })
    ).items.sort((a, b) => a.id - b.id); // the order they were made in, as the load fits them
    stars.push({ name: target.name, orbit: entered.orbit, measurements });
  }
  const kept = fitDemo(stars, anchor);
  writeFileSync(OUT, `${HEADER}${JSON.stringify(kept, null, 2)};\n`);
  execFileSync('npx', ['biome', 'format', '--write', OUT], { stdio: 'inherit' });
  console.log(`wrote ${kept.fits.length} fits at anchor ${anchor.today} to ${OUT}`);
} finally {
  database.close();
}
