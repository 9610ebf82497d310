/**
 * POST /api/sky/night and /api/sky/season through app.request() with no server: shapes, units,
 * and errors naming field, value and rule. The demo site and stars are invented.
 */
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';

const app = createApp();
const post = (path: string, body: unknown) =>
  app.request(path, {
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
const orbit = {
  elements: {
    periodYears: 41.623,
    periapsis: 'B1934.008',
    eccentricity: 0.2763,
    semiMajorAxisArcsec: 0.907,
    inclinationDeg: 59.025,
    ascendingNodeDeg: 23.717,
    argPeriapsisDeg: 219.907,
  },
};
const targets = [
  { name: 'Tern-3', raDeg: 271.3, decDeg: -25.1, orbit },
  { name: 'Vireo A', raDeg: 30, decDeg: 80 },
];

interface ErrorBody {
  error: {
    code: string;
    message: string;
    details: { field: string; value: unknown; rule: string };
  };
}

describe('POST /api/sky/night', () => {
  it('reports twilights, the Moon, windows in UTC and local time, and curves', async () => {
    const res = await post('/api/sky/night', {
      site,
      date: '2027-06-15',
      targets,
      limits: { zenithSeeingArcsec: 0.7 },
      curveStep: 'PT30M',
    });
    expect(res.status).toBe(200);
    const r = (await res.json()) as {
      night: { hours: number; start: { local: string } };
      sun: { twilights: { astronomical: { dusk: { utc: string; local: string } } } };
      moon: { illuminatedFraction: number };
      targets: {
        name: string;
        windows: {
          start: { utc: string; local: string };
          best: { airmass: number; seeingArcsec: number };
        }[];
        curve: { utc: string[]; altitudeDeg: number[] };
      }[];
      cautions: string[];
    };
    expect(r.night.start.local).toBe('2027-06-15T12:00:00-04:00'); // Chile keeps UTC−4 in its winter (IANA tz database, America/Santiago)
    expect(r.sun.twilights.astronomical.dusk.local.startsWith('2027-06-15T19:')).toBe(true);
    expect(r.moon.illuminatedFraction).toBeGreaterThan(0);
    const [tern, vireo] = r.targets;
    expect(tern!.windows).toHaveLength(1);
    expect(tern!.windows[0]!.best.airmass).toBeLessThan(1.01); // δ = −29° passes 4.4° from the zenith at φ = −24.6° (common practice, no source)
    expect(tern!.windows[0]!.best.seeingArcsec).toBeCloseTo(
      0.7 * tern!.windows[0]!.best.airmass ** 0.6,
      9,
    );
    expect(vireo!.windows).toEqual([]); // δ = +80° never rises at φ = −24.6°
    expect(tern!.curve.utc).toHaveLength(49); // 24 h every 30 min, both ends
    expect(r.cautions.length).toBeGreaterThan(0);
  });

  it('answers 422 naming the field for a bad site, target, date or limit, and 400 for a bad shape', async () => {
    const cases: [unknown, string, unknown][] = [
      [
        { site: { ...site, latitudeDeg: -95 }, date: '2027-06-15', targets },
        'site.latitudeDeg',
        -95,
      ],
      [
        { site: { ...site, timeZone: 'Chile/Atacama' }, date: '2027-06-15', targets },
        'site.timeZone',
        'Chile/Atacama',
      ],
      [{ site, date: '2027-02-30', targets }, 'date', '2027-02-30'],
      [
        { site, date: '2027-06-15', targets: [{ name: 'x', raDeg: 400, decDeg: 0 }] },
        'targets.0.raDeg',
        400,
      ],
      [{ site, date: '2027-06-15', targets: [targets[0], targets[0]] }, 'targets.1.name', 'Tern-3'],
      [
        { site, date: '2027-06-15', targets, limits: { highestAirmass: 0.5 } },
        'limits.highestAirmass',
        0.5,
      ],
      [{ site, date: '2027-06-15', targets, step: 'PT90M' }, 'step', 'PT90M'],
    ];
    for (const [body, field, value] of cases) {
      const res = await post('/api/sky/night', body);
      expect(res.status, field).toBe(422);
      const e = (await res.json()) as ErrorBody;
      expect(e.error.details.field).toBe(field);
      expect(e.error.details.value).toEqual(value);
      expect(e.error.details.rule.length).toBeGreaterThan(5);
    }
    const bad = await post('/api/sky/night', {
      site: { ...site, latitudeDeg: true },
      date: '2027-06-15',
      targets,
    });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { message: string } }).error.message).toMatch(
      /site\.latitudeDeg/,
    );
  });
});

describe('POST /api/sky/season', () => {
  it('gives hours per night for each target and its season', async () => {
    const res = await post('/api/sky/season', { site, year: 2027, targets, step: 'PT10M' });
    expect(res.status).toBe(200);
    const r = (await res.json()) as {
      nights: { date: string; darkHours: number }[];
      targets: {
        name: string;
        hoursPerNight: number[];
        season: { start: string | null; bestNight: string | null };
      }[];
    };
    expect(r.nights).toHaveLength(365);
    expect(r.nights[0]!.date).toBe('2027-01-01');
    expect(r.targets[0]!.hoursPerNight).toHaveLength(365);
    expect(r.targets[0]!.season.start).not.toBeNull();
    // A target at α ≈ 17.8h is best placed around the June solstice, when the Sun is near α = 6h (common practice, no source).
    const best = Date.parse(r.targets[0]!.season.bestNight!);
    expect(Math.abs(best - Date.parse('2027-06-17')) / 86_400_000).toBeLessThan(25);
    expect(r.targets[1]!.season.start).toBeNull();
    expect(Math.max(...r.targets[1]!.hoursPerNight)).toBe(0);
  });

  it('says whether each periapsis of an orbiting target falls in its season', async () => {
    // Invented demo orbit: periapsis at 2027-07-10T00:00Z, which is the evening of 9 July in Chile (UTC−4).
    const plover = {
      name: 'Plover',
      raDeg: 271.3,
      decDeg: -25.1,
      orbit: {
        elements: {
          periodYears: 0.9,
          periapsis: '2027-07-10T00:00:00Z',
          eccentricity: 0.5,
          semiMajorAxisArcsec: 0.05,
          inclinationDeg: 40,
          ascendingNodeDeg: 100,
          argPeriapsisDeg: 50,
        },
      },
    };
    const res = await post('/api/sky/season', {
      site,
      year: 2027,
      targets: [plover],
      step: 'PT10M',
    });
    const r = (await res.json()) as {
      nights: { date: string }[];
      targets: {
        hoursPerNight: number[];
        periapses: { epoch: string; night: string; hours: number; inSeason: boolean }[];
      }[];
    };
    const [p] = r.targets[0]!.periapses;
    expect(r.targets[0]!.periapses).toHaveLength(1);
    expect(p!.epoch).toBe('2027-07-10T00:00:00.000Z');
    expect(p!.night).toBe('2027-07-09');
    expect(p!.inSeason).toBe(true);
    expect(p!.hours).toBeCloseTo(
      r.targets[0]!.hoursPerNight[r.nights.findIndex((n) => n.date === '2027-07-09')]!,
      3,
    );
  });

  it('answers 422 for a year out of range', async () => {
    const res = await post('/api/sky/season', { site, year: 1066, targets });
    expect(res.status).toBe(422);
    expect(((await res.json()) as ErrorBody).error.details.field).toBe('year');
  });
});

describe('OpenAPI', () => {
  it('documents both sky endpoints with their request schemas', async () => {
    const doc = (await (await app.request('/api/openapi.json')).json()) as {
      paths: Record<string, { post?: { requestBody?: unknown } }>;
    };
    expect(doc.paths['/sky/night']?.post?.requestBody).toBeDefined();
    expect(doc.paths['/sky/season']?.post?.requestBody).toBeDefined();
  });
});
