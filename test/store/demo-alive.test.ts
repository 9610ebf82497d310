/**
 * The demo is alive on any date: loaded at three different moments (the suite's frozen clock, a year
 * and five years later), it shows its headline star's periapsis ahead, about seven months
 * out, with a finite ± from the solution fitted to the demo's own measurements, a past season of
 * nights with reports (some time lost) behind the moment and allocated nights ahead at both sites.
 */
import { describe, expect, it } from 'vitest';
import { JULIAN_YEAR_DAYS } from '../../server/science/constants.ts';
import { parseEpoch } from '../../server/science/time/index.ts';
import { DEMO_DAYS, HEADLINE, demoPeriapsis } from '../../server/store/demo/scenario.ts';
import { startStore } from '../../server/store/startup.ts';

const CLOCK = process.env.EPOCHWRIGHT_NOW ?? '2026-12-01T12:00:00Z';
const later = (years: number) =>
  new Date(Date.parse(CLOCK) + years * JULIAN_YEAR_DAYS * 86_400_000).toISOString();

describe.each([
  ['now', CLOCK],
  ['a year later', later(1)],
  ['five years later', later(5)],
])('the demo loaded %s', (_, now) => {
  it('flags the headline periapsis ahead with a finite ±, and has nights behind and ahead', async () => {
    const t0 = performance.now();
    const { store } = await startStore({ url: ':memory:', demo: true, now });
    const loadMs = performance.now() - t0;
    try {
      const solutions = (await store.orbitSolutions.list({}, { limit: 100 })).items;
      const current = solutions.filter((s) => s.current);
      expect(current.length).toBe(6); // every demo star
      for (const s of current) {
        expect(s.provenance).toBe('fitted');
        expect(s.orbit.covariance).toBeDefined();
        expect(s.fittedFrom?.length ?? 0).toBeGreaterThan(5);
      }
      const flags = await store.plans.flags(1, { nowJd: parseEpoch(now) });
      const peri = flags.flags.find((f) => f.kind === 'periapsis-ahead' && f.target === HEADLINE);
      expect(peri, JSON.stringify(flags.flags.map((f) => [f.kind, f.target]))).toBeDefined();
      const sigma = peri!.periapsis!.sigmaDays;
      expect(sigma !== null && Number.isFinite(sigma) && sigma > 0).toBe(true);
      // The fitted date lies within 4σ (and a day of light time) of the scenario's (invented) periapsis.
      const offset = Math.abs(parseEpoch(peri!.date) - parseEpoch(demoPeriapsis(now)));
      expect(offset).toBeLessThan(4 * sigma! + 1);
      expect(peri!.daysAhead).toBeGreaterThan(DEMO_DAYS.periapsis - 30);
      expect(peri!.daysAhead).toBeLessThan(DEMO_DAYS.periapsis + 30);

      const today = now.slice(0, 10);
      const nights = (await store.nights.list({}, { limit: 500 })).items;
      const reports = (await store.nightReports.list({}, { limit: 500 })).items;
      expect(nights.filter((n) => n.date < today).length).toBeGreaterThan(10);
      for (const siteId of [1, 2])
        expect(nights.filter((n) => n.siteId === siteId && n.date > today).length).toBeGreaterThan(
          2,
        );
      expect(reports.length).toBeGreaterThan(10);
      expect(reports.some((r) => r.timeLostHours > 0 && r.timeLostHours < 9)).toBe(true); // a night cut short
      expect(reports.filter((r) => r.timeLostHours >= 9).length).toBeGreaterThan(2); // nights lost whole
      console.log(
        `demo at ${now}: loaded in ${loadMs.toFixed(0)} ms; ${HEADLINE} periapsis ${peri!.date} ± ${sigma!.toFixed(2)} d`,
      );
    } finally {
      store.close();
    }
  });
});
