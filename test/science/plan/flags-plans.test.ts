/**
 * Flags that read the campaign's plans (constructed cases): stale predictions answered by a planned
 * epoch, not raised while no site can see the target (dated when it opens), ranked below the
 * periapsis flag; the periapsis flag's coverage of its ± window and the reason for each 0-h night.
 */
import * as Astronomy from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import { computeFlags } from '../../../server/science/plan/index.ts';
import { validateTarget } from '../../../server/science/sky/index.ts';
import { nightOf, nightSpan } from '../../../server/science/sky/index.ts';
import { jdToIso, jdToUnixMs, parseEpoch, unixMsToJd } from '../../../server/science/time/index.ts';
import { CONSTRAINTS, SITE, safeAt } from './helpers.ts';

const NOW = parseEpoch('2027-03-01T12:00:00Z');
const orbit = (periapsis: string) => ({
  elements: {
    periodYears: 12.5,
    periapsis,
    eccentricity: 0.9,
    semiMajorAxisArcsec: 0.12,
    inclinationDeg: 47,
    ascendingNodeDeg: 318,
    argPeriapsisDeg: 152,
  },
  distancePc: 11_500,
  covariance: {
    parameters: ['periodYears', 'periapsisDays'] as const,
    matrix: [
      [1e-8, 0],
      [0, 1],
    ],
  },
});

describe('flags that read the plans', () => {
  // astronomy-engine's Sun on the day: a star 5° from it is inside the 45° avoidance angle for weeks.
  const sun = Astronomy.Equator(
    Astronomy.Body.Sun,
    Astronomy.MakeTime(new Date('2027-03-01T12:00:00Z')),
    new Astronomy.Observer(0, 0, 0),
    false,
    true,
  );
  const hid = { raDeg: sun.ra * 15 + 5, decDeg: sun.dec };
  const hidden = validateTarget({ name: 'Hid', ...hid });
  const seen = validateTarget({
    name: 'Seen',
    raDeg: 258.7,
    decDeg: -33.2,
    orbit: orbit('2027-06-10T00:00:00Z'),
  });
  const nights = ['2027-06-08', '2027-06-09', '2027-06-11'];
  const flags = computeFlags(
    [
      { target: hidden, system: 'H', cadenceDays: 30, lastMeasuredJd: NOW - 100 },
      {
        target: seen,
        system: 'S',
        cadenceDays: 30,
        lastMeasuredJd: NOW - 100,
        planned: [{ jd: parseEpoch('2027-06-09T06:00:00Z'), site: SITE.name }],
      },
    ],
    [{ site: SITE, limits: CONSTRAINTS, nights }],
    { nowJd: NOW, leadDays: [30, 182] },
  );

  it('dates the stale flag of a target behind the Sun when it becomes observable, and ranks it last', () => {
    const st = flags.find((f) => f.kind === 'stale-prediction' && f.target === 'Hid')!;
    console.log(st.reason);
    expect(st.daysAhead).toBeGreaterThan(14); // constructed: 5° from the Sun, which moves ~1°/day; 45° avoidance
    // One convention for dates: the flag's date is the first open moment (UTC); its words name that night and site.
    const from = st.stale!.observableFrom!;
    expect(st.date).toBe(from.utc);
    expect(nightOf(parseEpoch(st.date), SITE.timeZone)).toBe(from.night);
    expect(st.reason).toContain(
      `by the night of ${from.night} at ${SITE.name}, when it can next be observed`,
    );
    // Independent route (astronomy-engine per instant, helpers.ts): at that moment the star is
    // observable, and three nights before at no moment of darkness (it rises ~4 min earlier each
    // night, so a 10-minute grid finds its first night within three).
    // The Moon counts too, while it is above the horizon.
    const obs = new Astronomy.Observer(SITE.latitudeDeg, SITE.longitudeDeg, SITE.elevationM);
    const moonClose = (jd: number) => {
      const t = Astronomy.MakeTime(new Date(jdToUnixMs(jd)));
      const m = Astronomy.Equator(Astronomy.Body.Moon, t, obs, true, true);
      const up = Astronomy.Horizon(t, obs, m.ra, m.dec).altitude > 0;
      const star = Astronomy.VectorFromSphere(new Astronomy.Spherical(hid.decDeg, hid.raDeg, 1), t);
      return up && Astronomy.AngleBetween(m.vec, star) < CONSTRAINTS.leastMoonDistanceDeg;
    };
    const jd = parseEpoch(st.date);
    expect(safeAt(SITE, CONSTRAINTS, hidden, jd, 0.3)).toBeNull();
    expect(moonClose(jd)).toBe(false);
    const before = nightSpan(SITE, nightOf(jd - 3, SITE.timeZone));
    for (let t = before.startJd; t < before.endJd; t += 5 / 1440)
      expect(safeAt(SITE, CONSTRAINTS, hidden, t) !== null || moonClose(t)).toBe(true);
    expect(flags[flags.length - 1]!.kind).toBe('stale-prediction');
    expect(flags.findIndex((f) => f.kind === 'periapsis-ahead')).toBeLessThan(
      flags.findIndex((f) => f.kind === 'stale-prediction'),
    );
  });

  it('raises no stale flag for a target whose next planned epoch comes within its cadence', () => {
    const planSoon = computeFlags(
      [
        {
          target: seen,
          system: 'S',
          cadenceDays: 30,
          lastMeasuredJd: NOW - 100,
          planned: [{ jd: NOW + 10, site: SITE.name }],
        },
      ],
      [{ site: SITE, limits: CONSTRAINTS }],
      { nowJd: NOW, leadDays: [30] },
    );
    expect(planSoon.some((f) => f.kind === 'stale-prediction')).toBe(false); // constructed: planned 10 d ahead, cadence 30 d
  });

  it('says which nights of the window are covered, and whether the most likely one is', () => {
    const p = flags.find((f) => f.kind === 'periapsis-ahead')!;
    console.log(p.periapsis!.coverage.text);
    expect(p.periapsis!.coverage.planned).toEqual([{ site: SITE.name, date: '2027-06-08' }]); // 06:00 UTC on 06-09 is the night of 06-08 at UTC−4 (constructed)
    expect(p.periapsis!.coverage.mostLikelyCovered).toBe(true); // the planned epoch lies 0.75 d before the date
    for (const s of p.periapsis!.sites)
      for (const n of s.nights) expect(n.hours > 0 || (n.words ?? '').length > 5).toBe(true); // every 0-h night names its limit
  });

  it('does not count a planned epoch on a night the Moon closes as covering the passage', () => {
    // Constructed case: a star on the Moon's place at the full Moon of June 2027 (astronomy-engine),
    // passing periapsis then, with one planned epoch at local midnight of that night.
    const full = Astronomy.SearchMoonPhase(180, Astronomy.MakeTime(new Date('2027-06-01')), 40)!;
    const fullJd = unixMsToJd(full.date.getTime());
    const obs = new Astronomy.Observer(SITE.latitudeDeg, SITE.longitudeDeg, SITE.elevationM);
    const moonAt = (jd: number) =>
      Astronomy.Equator(
        Astronomy.Body.Moon,
        Astronomy.MakeTime(new Date(jdToUnixMs(jd))),
        obs,
        false,
        true,
      );
    const m = moonAt(fullJd);
    const lune = validateTarget({
      name: 'Lune',
      raDeg: m.ra * 15,
      decDeg: m.dec,
      orbit: orbit(full.date.toISOString()),
    });
    const night = nightOf(fullJd, SITE.timeZone);
    const epoch = nightSpan(SITE, night).startJd + 0.5; // local midnight
    const q = moonAt(epoch);
    const sep = Astronomy.AngleBetween(
      Astronomy.VectorFromSphere(new Astronomy.Spherical(q.dec, q.ra * 15, 1), q.vec.t),
      Astronomy.VectorFromSphere(new Astronomy.Spherical(m.dec, m.ra * 15, 1), q.vec.t),
    );
    expect(sep).toBeLessThan(CONSTRAINTS.leastMoonDistanceDeg); // the premise: the Moon closes that moment
    const [flag] = computeFlags(
      [{ target: lune, system: 'L', planned: [{ jd: epoch, site: SITE.name }] }],
      [{ site: SITE, limits: CONSTRAINTS, nights: [night] }],
      { nowJd: fullJd - 100, leadDays: [182] },
    ).filter((f) => f.kind.startsWith('periapsis'));
    const c = flag!.periapsis!.coverage;
    console.log(c.text);
    expect(c.planned).toEqual([]);
    expect(c.closed).toHaveLength(1);
    expect(c.closed[0]!.date).toBe(night);
    expect(c.closed[0]!.words).toMatch(/the Moon \(\d+° away, limit \d+°\)/);
    expect(c.mostLikelyCovered).toBe(false); // the one epoch is within 1 d of the date but closed
    expect(c.text).toContain('planned but closed');
  });

  it('flags the coming planned epochs a relativity forecast depends on, soonest first', () => {
    // Constructed forecast: shares and detection epochs chosen by hand, one epoch in the past.
    const at = (d: number) => jdToIso(NOW + d);
    const forecast = {
      factors: [
        {
          name: 'redshiftFactor' as const,
          assumedValue: 1,
          sigmaNow: 0.5,
          sigmaAfter: 0.15,
          significanceNow: 2,
          significanceAfter: 6.7,
          reaches: [
            { sigma: 3, already: false, epoch: at(40) },
            { sigma: 5, already: false, epoch: at(60) },
          ],
          topEpochs: [
            { epoch: at(-3), kind: 'spectroscopy' as const, share: 0.5 },
            { epoch: at(20), kind: 'spectroscopy' as const, share: 0.3 },
            { epoch: at(30), kind: 'spectroscopy' as const, share: 0.05 },
          ],
        },
      ],
      plannedEpochs: 3,
      summary: ['redshift detectable at 5σ after the … epochs (2.0σ now)'],
      assumptions: '',
    };
    const [flag] = computeFlags([{ target: seen, system: 'S', forecast }], [], {
      nowJd: NOW,
      leadDays: [365],
    }).filter((f) => f.kind === 'relativity-epoch');
    console.log(flag!.reason);
    expect(flag!.date).toBe(at(20)); // the soonest coming epoch with ≥ 10 % of the information
    expect(flag!.relativity!.epochs.map((e) => e.epoch)).toEqual([at(20), at(40), at(60)]); // 5 % is below the threshold; the past epoch is left out
    expect(flag!.relativity!.epochs[1]!.reaches).toEqual(['redshift 3σ']);
    expect(flag!.reason).toMatch(/30 % of the redshift information/);
  });
});
