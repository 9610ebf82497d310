/**
 * Loads the invented demo campaign (see scenario.ts) in one transaction: systems, targets, orbit
 * solutions, sites, two campaigns, a season of nights with blocks, night reports for the nights
 * already past, and measurements made from the demo orbits with small invented errors.
 */
import { SiderealTime } from 'astronomy-engine';
import { DateTime } from 'luxon';
import { predict, validateOrbit, type OrbitInput } from '../../science/orbit/index.ts';
import {
  TWILIGHT_SUN_ALTITUDE_DEG,
  darknessExact,
  nightSpan,
  validateSite,
} from '../../science/sky/index.ts';
import { jdToIso, jdToUnixMs, parseEpoch, unixMsToJd } from '../../science/time/index.ts';
import type { Actor } from '../audit.ts';
import type { DbOrTx } from '../database.ts';
import type { StoreContext } from '../context.ts';
import type { SiteRow } from '../repos/sites.ts';
import {
  INSTRUMENTS,
  LANTERN,
  LANTERN_B_ORBIT,
  SITES,
  VESPER,
  VESPER_STARS,
  vesperOrbit,
} from './scenario.ts';
import { nowIso } from '../../clock.ts';

/** A small deterministic generator (LCG) so the demo is the same on every start. */
function noise(seed: number) {
  let s = seed >>> 0;
  const uniform = () => {
    s = (Math.imul(s, 1_664_525) + 1_013_904_223) >>> 0;
    return s / 2 ** 32;
  };
  return {
    uniform,
    gauss: () => Math.sqrt(-2 * Math.log(uniform() + 1e-12)) * Math.cos(2 * Math.PI * uniform()),
  };
}

function addDays(date: string, n: number): string {
  return DateTime.fromISO(date, { zone: 'UTC' }).plus({ days: n }).toISODate()!;
}

/**
 * Where to start a night's run of blocks lasting `minutes`: centred on the transit of `raDeg`
 * nearest local midnight, then moved inside astronomical darkness (the sky engine's Sun search).
 */
export function runStart(site: SiteRow, date: string, raDeg: number, minutes: number): DateTime {
  const midnight = DateTime.fromISO(`${date}T00:00`, { zone: site.timeZone }).plus({ days: 1 });
  const lstHours = SiderealTime(midnight.toJSDate()) + site.longitudeDeg / 15;
  const ha = (((((lstHours - raDeg / 15) % 24) + 36) % 24) - 12) * 0.99727; // hours, sidereal to solar
  let start = midnight.minus({ hours: ha, minutes: minutes / 2 });
  const sky = validateSite(site);
  const dark = darknessExact(sky, nightSpan(sky, date), TWILIGHT_SUN_ALTITUDE_DEG.astronomical)[0];
  if (dark) {
    const earliest = DateTime.fromMillis(jdToUnixMs(dark.startJd) + 5 * 60_000, {
      zone: site.timeZone,
    });
    const latest = DateTime.fromMillis(jdToUnixMs(dark.endJd) - (minutes + 5) * 60_000, {
      zone: site.timeZone,
    });
    if (start > latest) start = latest;
    if (start < earliest) start = earliest;
  }
  return start;
}

interface Plan {
  campaignId: number;
  siteIndex: number;
  dates: string[];
  targets: {
    id: number;
    raDeg: number;
    orbit: OrbitInput;
    kinds: ('astrometry' | 'spectroscopy')[];
  }[];
}

export interface DemoOptions {
  /** Nights before this date get reports and measurements; later ones stay planned. Default: today. */
  today?: string;
}

export async function loadDemo(
  store: StoreContext,
  actor: Actor,
  options: DemoOptions = {},
): Promise<{ nights: number; blocks: number; reports: number; measurements: number }> {
  const today = options.today ?? nowIso().slice(0, 10);
  const counts = { nights: 0, blocks: 0, reports: 0, measurements: 0 };
  await store.db.transaction(async (tx) => {
    const rnd = noise(20261201);
    const vesper = await store.systems.createIn(tx, actor, VESPER);
    const lantern = await store.systems.createIn(tx, actor, LANTERN);
    const stars = [];
    for (const s of VESPER_STARS) {
      const t = await store.targets.createIn(tx, actor, {
        systemId: vesper.id,
        name: s.name,
        magnitude: s.magnitude,
        band: s.band,
      });
      const orbit = vesperOrbit(s);
      await store.orbitSolutions.createIn(tx, actor, {
        targetId: t.id,
        orbit,
        provenance: 'entered',
        reference: 'demo scenario (invented)',
      });
      stars.push({ target: t, orbit });
    }
    const lanternB = await store.targets.createIn(tx, actor, {
      systemId: lantern.id,
      name: 'Lantern B',
      magnitude: 7.9,
      band: 'V',
    });
    await store.orbitSolutions.createIn(tx, actor, {
      targetId: lanternB.id,
      orbit: LANTERN_B_ORBIT,
      provenance: 'entered',
      reference: 'demo scenario (invented)',
    });
    const sites = [];
    for (const s of SITES) sites.push(await store.sites.createIn(tx, actor, s));

    const passage = await store.campaigns.createIn(tx, actor, {
      name: 'Vesper Core passage 2026–2027',
      startDate: '2026-03-01',
      endDate: '2027-10-31',
      goals: {
        cadenceDays: 14,
        densifiedCadenceDays: 7,
        densifyWithinDays: 30,
        kinds: ['astrometry', 'spectroscopy'],
        laserGuideStar: { astrometry: true },
      },
      limits: { highestAirmass: 1.8, leastMoonDistanceDeg: 30, darkness: 'astronomical' },
      targetIds: stars.map((s) => s.target.id),
      siteIds: sites.map((s) => s.id),
      notes:
        'Follow VC s1 through its periapsis in June 2027; keep the other stars on a yearly cadence.',
    });
    const binary = await store.campaigns.createIn(tx, actor, {
      name: 'Lantern Pair orbit 2026–2027',
      startDate: '2026-10-01',
      endDate: '2027-04-30',
      goals: { cadenceDays: 21, kinds: ['astrometry'] },
      limits: { highestAirmass: 2, darkness: 'nautical' },
      targetIds: [lanternB.id],
      siteIds: [sites[1]!.id],
    });

    const every = (from: string, to: string, step: number) => {
      const out: string[] = [];
      for (let d = from; d <= to; d = addDays(d, step)) out.push(d);
      return out;
    };
    const s1 = stars[0]!,
      s2 = stars[1]!;
    const dense = every('2027-05-15', '2027-07-15', 7);
    const plans: Plan[] = [
      {
        campaignId: passage.id,
        siteIndex: 0,
        dates: every('2026-04-04', '2026-09-26', 14),
        targets: [
          {
            id: s1.target.id,
            raDeg: VESPER.raDeg,
            orbit: s1.orbit,
            kinds: ['astrometry', 'spectroscopy'],
          },
          { id: s2.target.id, raDeg: VESPER.raDeg, orbit: s2.orbit, kinds: ['astrometry'] },
        ],
      },
      {
        campaignId: passage.id,
        siteIndex: 0,
        dates: [...new Set([...every('2027-03-06', '2027-09-25', 14), ...dense])].sort(),
        targets: [
          {
            id: s1.target.id,
            raDeg: VESPER.raDeg,
            orbit: s1.orbit,
            kinds: ['astrometry', 'spectroscopy'],
          },
        ],
      },
      {
        campaignId: passage.id,
        siteIndex: 1,
        dates: every('2027-04-03', '2027-08-28', 28),
        targets: [
          { id: s1.target.id, raDeg: VESPER.raDeg, orbit: s1.orbit, kinds: ['spectroscopy'] },
        ],
      },
      {
        campaignId: binary.id,
        siteIndex: 1,
        dates: every('2026-10-10', '2027-04-24', 21),
        targets: [
          { id: lanternB.id, raDeg: LANTERN.raDeg, orbit: LANTERN_B_ORBIT, kinds: ['astrometry'] },
        ],
      },
    ];
    for (const plan of plans) {
      const site = sites[plan.siteIndex]!;
      for (const date of plan.dates) {
        const night = await store.nights.createIn(tx, actor, {
          siteId: site.id,
          campaignId: plan.campaignId,
          date,
        });
        counts.nights++;
        const past = date < today;
        const lost = past && rnd.uniform() < 0.2;
        const outcomes = [];
        const blockCount = plan.targets.reduce((n, t) => n + t.kinds.length, 0);
        const first = runStart(site, date, plan.targets[0]!.raDeg, blockCount * 50);
        let offset = 0;
        for (const t of plan.targets) {
          for (const kind of t.kinds) {
            const start = first.plus({ minutes: offset });
            offset += 50;
            const block = await store.blocks.createIn(tx, actor, {
              nightId: night.id,
              targetId: t.id,
              kind,
              startUtc: start.toUTC().toISO()!,
              endUtc: start.plus({ minutes: 45 }).toUTC().toISO()!,
              laserGuideStar:
                site.laserGuideStar && kind === 'astrometry' && t.raDeg === VESPER.raDeg,
              origin: 'season-plan', // the demo's nights stand for an earlier accepted plan, so a re-plan may replace their future blocks
            });
            counts.blocks++;
            if (!past) continue;
            outcomes.push({
              blockId: block.id,
              status: lost ? 'lost' : 'obtained',
              exposureMinutes: lost ? 0 : 40,
            });
            if (!lost) {
              await addMeasurement(
                store,
                tx,
                actor,
                t.id,
                t.orbit,
                block.id,
                kind,
                start.plus({ minutes: 22 }).toUTC().toISO()!,
                rnd,
                t.raDeg === LANTERN.raDeg,
              );
              counts.measurements++;
            }
          }
        }
        if (past) {
          await store.nightReports.createIn(tx, actor, {
            nightId: night.id,
            seeingArcsec: Number((0.45 + 0.5 * rnd.uniform()).toFixed(2)),
            strehlRatio: site.laserGuideStar
              ? Number((0.25 + 0.35 * rnd.uniform()).toFixed(2))
              : null,
            cloudCoverPct: lost ? 90 : Math.round(20 * rnd.uniform()),
            humidityPct: lost ? 88 : Math.round(8 + 30 * rnd.uniform()),
            windMS: Number((2 + 9 * rnd.uniform()).toFixed(1)),
            temperatureC: Number(((site.temperatureC ?? 5) - 3 + 4 * rnd.uniform()).toFixed(1)),
            timeLostHours: lost ? 9.5 : 0,
            timeLostReason: lost ? 'dome closed: humidity above the limit' : '',
            notes: lost ? 'Fog from the valley all night.' : 'Stable night.',
            outcomes,
          });
          counts.reports++;
        }
      }
    }
    // Earlier seasons: one astrometric epoch a year per star, made before this campaign began.
    for (const { target, orbit } of stars) {
      for (let year = 2018; year <= 2025; year++) {
        await addMeasurement(
          store,
          tx,
          actor,
          target.id,
          orbit,
          null,
          'astrometry',
          jdToIso(parseEpoch(`J${year}.45`)),
          rnd,
          false,
        );
        counts.measurements++;
      }
    }
  });
  return counts;
}

async function addMeasurement(
  store: StoreContext,
  tx: DbOrTx,
  actor: Actor,
  targetId: number,
  orbitInput: OrbitInput,
  blockId: number | null,
  kind: 'astrometry' | 'spectroscopy',
  epoch: string,
  rnd: ReturnType<typeof noise>,
  speckle: boolean,
) {
  const p = predict(validateOrbit(orbitInput), unixMsToJd(Date.parse(epoch)));
  const round = (x: number, d: number) => Number(x.toFixed(d));
  const base = { targetId, blockId, epoch };
  if (kind === 'spectroscopy') {
    await store.measurements.createIn(tx, actor, {
      ...base,
      kind: 'radial-velocity',
      radialVelocityKmS: round(p.radialVelocityKmS! + 12 * rnd.gauss(), 1),
      sigmaRadialVelocityKmS: 12,
      instrument: INSTRUMENTS.spectrograph,
    });
  } else if (speckle) {
    await store.measurements.createIn(tx, actor, {
      ...base,
      kind: 'separation',
      separationMas: round(p.separationMas + 2 * rnd.gauss(), 1),
      positionAngleDeg: round((p.positionAngleDeg + 0.3 * rnd.gauss() + 360) % 360, 2),
      sigmaSeparationMas: 2,
      sigmaPositionAngleDeg: 0.3,
      instrument: INSTRUMENTS.speckle,
    });
  } else {
    await store.measurements.createIn(tx, actor, {
      ...base,
      kind: 'offsets',
      dRaMas: round(p.dRaMas + 0.4 * rnd.gauss(), 2),
      dDecMas: round(p.dDecMas + 0.4 * rnd.gauss(), 2),
      sigmaDRaMas: 0.4,
      sigmaDDecMas: 0.4,
      correlation: 0.1,
      instrument: INSTRUMENTS.imager,
    });
  }
}
