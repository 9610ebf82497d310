/**
 * A site's statistics and clear-night prior through the API, on both backends: the loss of a
 * logged night against astronomy-engine's own darkness, the Beta-prior rule with a stored prior,
 * the airmass of a measurement against astronomy-engine's Horizon, and refusals that write nothing.
 */
import { Body, Horizon, Observer, SearchAltitude } from 'astronomy-engine';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS, fixture, tableCounts, type Fixture } from '../store/backends.ts';

interface Stats {
  months: {
    month: number;
    nights: number;
    darkHours: number;
    lostHours: number;
    loggedLossFraction: number | null;
    loss: { mean: number; alpha: number; beta: number; prior: string; nights: number };
    reasons: { reason: string }[];
    seeingArcsec: { median: number } | null;
  }[];
  precision: {
    instrument: string;
    n: number;
    medianSigma: number;
    byAirmass: { low: number; high: number | null; n: number }[];
  }[];
  priors: unknown[];
}

/** Astronomical darkness of the night of 2026-06-10 at the fixture's site, straight from astronomy-engine. */
function darkHoursByAstronomyEngine(): number {
  // the fixture's site: −24.9°, −69.5°, 2700 m (test/store/backends.ts)
  const obs = new Observer(-24.9, -69.5, 2700);
  const noon = new Date('2026-06-10T16:00:00Z'); // local noon in America/Santiago (UTC−4 in June)
  const dusk = SearchAltitude(Body.Sun, obs, -1, noon, 1, -18)!; // astronomical twilight, −18° (Explanatory Supplement)
  const dawn = SearchAltitude(Body.Sun, obs, +1, dusk, 1, -18)!;
  return (dawn.ut - dusk.ut) * 24;
}

describe.each(BACKENDS)('site statistics on $name', (backend) => {
  let f: Fixture;
  let cleanup: () => void;
  beforeAll(async () => {
    const opened = await backend.open();
    cleanup = opened.cleanup;
    f = await fixture(opened.store);
    const report = await f.call('observer', 'POST', '/api/night-reports', {
      nightId: f.ids.night,
      seeingArcsec: 0.8,
      timeLostHours: 3,
      timeLostReason: 'cloud from the west',
      outcomes: [{ blockId: f.ids.block, status: 'obtained' }],
    });
    expect(report.status, await report.clone().text()).toBe(201);
    const m = await f.call('observer', 'POST', '/api/measurements', {
      targetId: f.ids.target,
      blockId: f.ids.block,
      kind: 'offsets',
      epoch: '2026-06-11T04:30:00Z',
      dRaMas: 10,
      dDecMas: 20,
      sigmaDRaMas: 0.3,
      sigmaDDecMas: 0.4,
      instrument: 'test imager',
    });
    expect(m.status, await m.clone().text()).toBe(201);
  });
  afterAll(() => cleanup());

  it('gives the loss of the logged night against astronomy-engine’s darkness, with a flat prior', async () => {
    const res = await f.call('viewer', 'GET', `/api/sites/${f.ids.site}/statistics`);
    expect(res.status, await res.clone().text()).toBe(200);
    const s = (await res.json()) as Stats;
    const june = s.months[5]!;
    const dark = darkHoursByAstronomyEngine();
    expect(Math.abs(june.darkHours - dark) * 3600).toBeLessThan(5); // seconds: both search the −18° crossings
    expect(june.loggedLossFraction).toBeCloseTo(3 / dark, 4);
    // flat Beta(1, 1) + one night of share f: mean (1 + f)/3 (constructed case)
    expect(june.loss.mean).toBeCloseTo((1 + 3 / dark) / 3, 4);
    expect(june.loss.prior).toBe('flat');
    expect(june.reasons[0]!.reason).toBe('cloud from the west');
    expect(june.seeingArcsec!.median).toBe(0.8);
    expect(s.months[0]!.nights).toBe(0);
  });

  it('reads the measurement’s airmass at the epoch as astronomy-engine does', async () => {
    const s = (await (
      await f.call('viewer', 'GET', `/api/sites/${f.ids.site}/statistics`)
    ).json()) as Stats;
    const [p] = s.precision;
    expect(p!.instrument).toBe('test imager');
    expect(p!.medianSigma).toBeCloseTo(Math.sqrt((0.3 ** 2 + 0.4 ** 2) / 2), 12); // RMS of the two components (constructed case)
    // the system's direction (263.8°, −21.7°) at the epoch, through astronomy-engine's Horizon
    const obs = new Observer(-24.9, -69.5, 2700);
    const t = new Date('2026-06-11T04:30:00Z');
    const hor = Horizon(t, obs, 263.8 / 15, -21.7, 'normal');
    const z = 90 - hor.altitude;
    const x = 1 / (Math.cos((z * Math.PI) / 180) + 0.50572 * (96.07995 - z) ** -1.6364); // Kasten & Young (1989)
    const bin = p!.byAirmass.find((b) => b.n === 1)!;
    expect(x).toBeGreaterThanOrEqual(bin.low - 0.02);
    if (bin.high !== null) expect(x).toBeLessThan(bin.high + 0.02);
  });

  it('stores a prior and applies the Beta rule in closed form', async () => {
    const put = await f.call('lead', 'PUT', `/api/sites/${f.ids.site}/clear-prior`, {
      months: [{ month: 6, clearFraction: 0.7, strengthNights: 10 }],
    });
    expect(put.status, await put.clone().text()).toBe(200);
    const prior = (await put.json()) as { months: ({ month: number } | null)[] };
    expect(prior.months).toHaveLength(12);
    expect(prior.months[5]).toEqual({ month: 6, clearFraction: 0.7, strengthNights: 10 });
    const s = (await (
      await f.call('viewer', 'GET', `/api/sites/${f.ids.site}/statistics`)
    ).json()) as Stats;
    const june = s.months[5]!;
    const share = june.loggedLossFraction!;
    // Beta(3, 7) + share: α = 3 + f, β = 7 + 1 − f (constructed case)
    expect(june.loss.alpha).toBeCloseTo(3 + share, 12);
    expect(june.loss.beta).toBeCloseTo(8 - share, 12);
    expect(june.loss.mean).toBeCloseTo((3 + share) / 11, 12);
    expect(june.loss.prior).toBe('user');
  });

  it('stores a prior sent as CSV, and refuses a bad row naming its line and column', async () => {
    const path = `/api/sites/${f.ids.site}/clear-prior`;
    const put = await f.call('lead', 'PUT', path, {
      csv: 'month,clear_fraction,strength_nights\n5,0.55,6\n7,0.4\n',
      strengthNights: 4,
    });
    expect(put.status, await put.clone().text()).toBe(200);
    const prior = (await put.json()) as { months: unknown[] };
    expect(prior.months[4]).toEqual({ month: 5, clearFraction: 0.55, strengthNights: 6 });
    expect(prior.months[6]).toEqual({ month: 7, clearFraction: 0.4, strengthNights: 4 });
    expect(prior.months.filter((m) => m !== null)).toHaveLength(2); // the rest are cleared
    const before = await tableCounts(f.store);
    const bad = await f.call('lead', 'PUT', path, {
      csv: 'month,clear_fraction\n5,0.55\n8,1.4\n',
    });
    expect(bad.status).toBe(422);
    const text = await bad.text();
    expect(text).toContain('line 3 clear_fraction'); // the row of month 8, header on line 1
    const weak = await f.call('lead', 'PUT', path, {
      csv: 'month,clear_fraction\n5,0.5\n',
      strengthNights: 0,
    });
    expect(weak.status).toBe(422);
    expect(await weak.text()).toContain('strengthNights');
    expect(await tableCounts(f.store)).toEqual(before);
  });

  it('refuses bad priors and roles, naming the field, and writes nothing', async () => {
    const before = await tableCounts(f.store);
    const path = `/api/sites/${f.ids.site}/clear-prior`;
    const twice = await f.call('lead', 'PUT', path, {
      months: [
        { month: 2, clearFraction: 0.5, strengthNights: 3 },
        { month: 2, clearFraction: 0.6, strengthNights: 3 },
      ],
    });
    expect(twice.status).toBe(422);
    expect(await twice.text()).toContain('months.1.month');
    const weak = await f.call('lead', 'PUT', path, {
      months: [{ month: 2, clearFraction: 0.5, strengthNights: 0 }],
    });
    expect(weak.status).toBe(422);
    expect(await weak.text()).toContain('months.0.strengthNights');
    const out = await f.call('lead', 'PUT', path, {
      months: [{ month: 13, clearFraction: 0.5, strengthNights: 3 }],
    });
    expect(out.status).toBe(422); // month 13 is out of range: a broken rule (README "HTTP API")
    expect(
      (await f.call('observer', 'PUT', path, { months: [] })).status, // lead writes (DESIGN.md roles)
    ).toBe(403);
    expect((await f.call('viewer', 'GET', '/api/sites/9999/statistics')).status).toBe(404);
    expect(
      (await f.call('viewer', 'GET', `/api/sites/${f.ids.site}/statistics?start=2027-13-01`))
        .status,
    ).toBe(422); // a date in the wrong format breaks a rule (README "HTTP API": 422)
    expect(await tableCounts(f.store)).toEqual(before);
  });
});
