/**
 * Cost bounds before work: a request whose size is beyond a documented bound is refused with 422
 * naming the field, the value and the bound, and never reaches a worker. Bounds: COST_BOUNDS
 * (this project's rule, README "Bounds on work"). Sites and stars are invented demo values.
 */
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';
import { COST_BOUNDS, checkCost } from '../../server/jobs/cost.ts';
import { InputError } from '../../server/science/errors.ts';
import { inProcess, type Runner } from '../../server/jobs/tasks.ts';

const ran: string[] = [];
const spy: Runner = (name, ...args) => {
  ran.push(name);
  return inProcess(name, ...args);
};
const app = createApp({ run: spy });
const post = (path: string, body: unknown) =>
  app.request(`/api${path}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(body),
  });
const site = {
  name: 'Loma Serena',
  latitudeDeg: -24.6,
  longitudeDeg: -70.4,
  elevationM: 2600,
  timeZone: 'America/Santiago',
};
const targets = Array.from({ length: 200 }, (_, i) => ({
  name: `Wren-${i}`,
  raDeg: (i * 1.7) % 360,
  decDeg: -60 + (i % 90),
}));
const measurements = Array.from({ length: 30 }, (_, i) => ({
  kind: 'offsets',
  epoch: `JD ${2460000 + i * 40}`,
  dRaMas: 10 + i,
  dDecMas: 5 - i,
  sigmaDRaMas: 1,
  sigmaDDecMas: 1,
}));

interface Refusal {
  error: { code: string; details: { field: string; value: unknown; rule: string } };
}

describe('cost bounds', () => {
  it('refuses a sampled fit beyond measurements × walkers × rounds, naming field and bound', async () => {
    ran.length = 0;
    const res = await post('/fit', {
      stars: [{ name: 'Tarn', measurements }],
      posterior: { seed: 1, ensembleSize: 1000, rounds: 100_000 },
    });
    expect(res.status).toBe(422);
    const { error } = (await res.json()) as Refusal;
    expect(error.details.field).toBe('posterior.rounds');
    expect(error.details.value).toBe(100_000);
    expect(error.details.rule).toContain(COST_BOUNDS.posteriorEvaluations.toLocaleString('en'));
    expect(error.details.rule).toContain('30 × 1000 × 100000'); // the cost as computed, shown to the caller
    expect(ran).toEqual([]); // refused before any work
  });

  it('refuses a night of 200 targets at 0.6-second steps, and takes the same targets at the default step', async () => {
    ran.length = 0;
    const fine = await post('/sky/night', {
      site,
      date: '2027-06-15',
      targets,
      step: 'PT0.6S',
      curveStep: 'PT0.6S',
    });
    expect(fine.status).toBe(422);
    const { error } = (await fine.json()) as Refusal;
    expect(error.details.field).toBe('step');
    expect(error.details.rule).toContain(COST_BOUNDS.nightSamples.toLocaleString('en'));
    expect(ran).toEqual([]);
    const coarse = await post('/sky/night', {
      site,
      date: '2027-06-15',
      targets: targets.slice(0, 3),
    });
    expect(coarse.status).toBe(200);
    expect(ran).toEqual(['nightReport']);
  });

  it('refuses Monte Carlo ephemerides beyond epochs × draws', async () => {
    const res = await post('/ephemeris', {
      orbit: {
        elements: {
          periodYears: 10,
          periapsis: 'J2018.1',
          eccentricity: 0.4,
          semiMajorAxisArcsec: 0.15,
          inclinationDeg: 60,
          ascendingNodeDeg: 160,
          argPeriapsisDeg: 45,
        },
        covariance: { parameters: ['periodYears'], matrix: [[0.01]] },
      },
      epochs: { start: '2027-01-01', end: '2037-01-01', step: 'P1D' },
      monteCarlo: { draws: 100_000, seed: 1 },
    });
    expect(res.status).toBe(422);
    const { error } = (await res.json()) as Refusal;
    expect(error.details.field).toBe('monteCarlo.draws');
    expect(error.details.rule).toContain(COST_BOUNDS.ephemerisEvaluations.toLocaleString('en'));
  });

  it('refuses a relativity forecast and a campaign’s flags beyond their bounds, before any work', () => {
    const refusal = (f: () => void) => {
      try {
        f();
      } catch (err) {
        return err as InputError;
      }
      throw new Error('not refused');
    };
    // Constructed case: one row past forecastRows; the rows are never looked at, only counted.
    const rows = Array.from({ length: COST_BOUNDS.forecastRows + 1 }, () => ({}));
    const forecast = refusal(() =>
      checkCost('forecastDetection', { measurements: rows, plan: [] } as never),
    );
    expect(forecast).toBeInstanceOf(InputError);
    expect(forecast.field).toBe('measurements');
    expect(forecast.rule).toContain('forecastRows');
    expect(() =>
      checkCost('forecastDetection', { measurements: rows.slice(2), plan: [{}] } as never),
    ).not.toThrow();
    // 200 targets × 2 sites × 100,000 days ahead = 40,000,000 > flagTargetSiteDays (constructed case).
    const many = Array.from({ length: 200 }, () => ({}));
    const flags = refusal(() =>
      checkCost('computeFlags', many as never, [{}, {}] as never, {
        nowJd: 2461000,
        leadDays: [30, 100_000],
      }),
    );
    expect(flags.field).toBe('leadDays');
    expect(flags.rule).toContain('flagTargetSiteDays');
    expect(() =>
      checkCost('computeFlags', many as never, [{}, {}] as never, { nowJd: 2461000 }),
    ).not.toThrow();
  });
});
