/**
 * Loads the invented demo campaign (see scenario.ts) in one transaction, relative to the clock:
 * systems, targets, sites, two campaigns, seasons of nights with blocks, night reports for the
 * nights already past (some lost, some cut short), measurements made from the scenario's orbits
 * with invented errors, and for every star two orbit-solution versions: the scenario's orbit as
 * entered, and the orbit engine's own fit to the demo measurements (current, with covariance;
 * kept in the repository relative to the anchor, see fits.ts).
 */
import type { BlockKind } from '../../../descriptors/measurement-kinds.ts';
import { SiderealTime } from 'astronomy-engine';
import { DateTime } from 'luxon';
import { predict, validateOrbit, type OrbitInput } from '../../science/orbit/index.ts';
import { validateLimits, validateSite, validateTarget } from '../../science/sky/index.ts';
import { nightMoments } from '../../science/plan/index.ts';
import { addDays } from '../../science/sky/night.ts';
import { unixMsToJd } from '../../science/time/index.ts';
import type { Actor } from '../audit.ts';
import type { DbOrTx } from '../database.ts';
import type { StoreContext } from '../context.ts';
import type { SiteRow } from '../repos/sites.ts';
import type { MeasurementRow } from '../repos/measurements.ts';
import { replaceClearPriorIn } from '../repos/clear-priors.ts';
import { nightTimes } from '../repos/night-times.ts';
import { demoSolutions } from './fits.ts';
import {
  DEMO_DAYS,
  HEADLINE,
  INSTRUMENTS,
  SITES,
  DEMO_CLEAR_PRIORS,
  DEMO_PRIOR_STRENGTH,
  VESPER_STARS,
  demoAnchor,
  brindleOrbit,
  brindleSystem,
  lanternOrbit,
  lanternSystem,
  vesperOrbit,
  vesperSystem,
  type DemoAnchor,
} from './scenario.ts';
import { asOf, nowIso } from '../../clock.ts';
import * as schema from '../../../db/schema.ts';
import { rememberRows } from '../crud.ts';

/**
 * Seed of the targets' measurement errors. Chosen among a few so that the headline star's fitted
 * periapsis lands within 0.5σ of the scenario's (a typical draw, not a lucky or an unlucky one).
 */
const DEMO_ERROR_SEED = 2;

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

/**
 * Where to start a night's run of blocks lasting `minutes`: centred on the transit of `raDeg`
 * nearest local midnight, then moved inside astronomical darkness (the sky engine's Sun search).
 */
function runStart(site: SiteRow, date: string, raDeg: number, minutes: number): DateTime {
  const midnight = DateTime.fromISO(`${date}T00:00`, { zone: site.timeZone }).plus({ days: 1 });
  const lstHours = SiderealTime(midnight.toJSDate()) + site.longitudeDeg / 15;
  const ha = (((((lstHours - raDeg / 15) % 24) + 36) % 24) - 12) * 0.99727; // hours, sidereal to solar
  let start = midnight.minus({ hours: ha, minutes: minutes / 2 });
  // The store's own night times (remembered), which its block rules then read again.
  const dark = nightTimes(site, date, 'astronomical').dark[0];
  if (dark) {
    const earliest = DateTime.fromMillis(dark.startMs + 5 * 60_000, { zone: site.timeZone });
    const latest = DateTime.fromMillis(dark.endMs - (minutes + 5) * 60_000, {
      zone: site.timeZone,
    });
    if (start > latest) start = latest;
    if (start < earliest) start = earliest;
  }
  return start;
}

interface PlanTarget {
  id: number;
  raDeg: number;
  decDeg: number;
  orbit: OrbitInput;
  kinds: BlockKind[];
  /** Measured as separation and position angle (a visual binary) rather than offsets. */
  speckle?: boolean;
}

interface Plan {
  campaignId: number;
  limits: (typeof DEMO_LIMITS)[keyof typeof DEMO_LIMITS];
  siteIndex: number;
  dates: string[];
  targets: PlanTarget[];
}

export interface DemoOptions {
  /** The moment the scenario is built around (ISO 8601); nights before its day get reports. Default: the clock. */
  now?: string;
  /** Run the fits now instead of shifting the kept ones (fits.ts) to the anchor: what `npm run demo-fits` keeps. */
  fitNow?: boolean;
}

/** Every night of a range given in days from the anchor. */
function nightsOf(anchor: DemoAnchor, r: { start: number; end: number; step: number }): string[] {
  const out: string[] = [];
  for (let d = r.start; d <= r.end; d += r.step) out.push(anchor.day(d));
  return out;
}

type Counts = { nights: number; blocks: number; reports: number; measurements: number };
type Star = {
  target: { id: number; name: string };
  orbit: OrbitInput;
  raDeg: number;
  decDeg: number;
};

/** The two campaigns' limits: stored with each campaign, and obeyed by the demo's own blocks. */
const DEMO_LIMITS = {
  passage: { highestAirmass: 1.8, leastMoonDistanceDeg: 30, darkness: 'astronomical' },
  binary: { highestAirmass: 2, darkness: 'nautical' },
} as const;
type Made = Map<number, MeasurementRow[]>;

export async function loadDemo(
  store: StoreContext,
  actor: Actor,
  options: DemoOptions = {},
): Promise<Counts> {
  const now = options.now ?? nowIso();
  const anchor = demoAnchor(now);
  const counts: Counts = { nights: 0, blocks: 0, reports: 0, measurements: 0 };
  // Written as of its own moment: the store's rules (nights over, measurements made) read that clock.
  await asOf(Date.parse(now), () =>
    store.db.transaction(async (tx) => {
      // Each block and measurement looks up the same few catalogue rows: read each once.
      rememberRows(tx, [
        schema.systems,
        schema.targets,
        schema.sites,
        schema.campaigns,
        schema.nights,
      ]);
      const { stars, lanternB, brindleB } = await demoCatalogue(store, tx, actor, anchor);
      const sites = await demoSites(store, tx, actor);
      const campaigns = await demoCampaigns(store, tx, actor, anchor, stars, lanternB, sites);
      const perTarget = new Map<number, ReturnType<typeof noise>>();
      const errors = (id: number) => {
        if (!perTarget.has(id)) perTarget.set(id, noise(DEMO_ERROR_SEED + 7919 * id));
        return perTarget.get(id)!;
      };
      const ctx = {
        store,
        tx,
        actor,
        rnd: noise(20261201),
        errors,
        made: new Map() as Made,
        counts,
        anchor,
        usedNights: new Set<string>(),
      };
      for (const plan of demoPlans(anchor, campaigns, stars, lanternB))
        await loadPlan(ctx, sites[plan.siteIndex]!, plan);
      await earlierEpochs(ctx, stars, lanternB);
      await doubleLinedEpochs(ctx, brindleB);
      await storeFits(ctx, [...stars, brindleB], lanternB, options.fitNow ?? false);
    }),
  );
  return counts;
}

/** The two systems, their targets, and each target's scenario orbit as version 1 (`entered`). */
async function demoCatalogue(store: StoreContext, tx: DbOrTx, actor: Actor, anchor: DemoAnchor) {
  const vesper = await store.systems.createIn(tx, actor, vesperSystem(anchor));
  const lantern = await store.systems.createIn(tx, actor, lanternSystem(anchor));
  const stars: Star[] = [];
  for (const s of VESPER_STARS) {
    const target = await store.targets.createIn(tx, actor, {
      systemId: vesper.id,
      name: s.name,
      magnitude: s.magnitude,
      band: s.band,
    });
    stars.push({
      target,
      orbit: vesperOrbit(s, anchor),
      raDeg: vesper.raDeg,
      decDeg: vesper.decDeg,
    });
  }
  const pair = async (
    system: { id: number; raDeg: number; decDeg: number },
    name: string,
    magnitude: number,
    orbit: OrbitInput,
  ): Promise<Star> => ({
    target: await store.targets.createIn(tx, actor, {
      systemId: system.id,
      name,
      magnitude,
      band: 'V',
    }),
    orbit,
    raDeg: system.raDeg,
    decDeg: system.decDeg,
  });
  const lanternB = await pair(lantern, 'Lantern B', 7.9, lanternOrbit(anchor));
  const brindle = await store.systems.createIn(tx, actor, brindleSystem(anchor));
  const brindleB = await pair(brindle, 'Brindle B', 8.6, brindleOrbit(anchor));
  for (const { target, orbit } of [...stars, lanternB, brindleB])
    await store.orbitSolutions.createIn(tx, actor, {
      targetId: target.id,
      orbit,
      provenance: 'entered',
      reference: 'demo scenario (invented): the orbit the measurements were drawn from',
    });
  return { stars, lanternB, brindleB };
}

/** The two sites, each with its monthly clear-night prior. */
async function demoSites(store: StoreContext, tx: DbOrTx, actor: Actor): Promise<SiteRow[]> {
  const sites: SiteRow[] = [];
  for (const s of SITES) sites.push(await store.sites.createIn(tx, actor, s));
  for (const [i, site] of sites.entries())
    await replaceClearPriorIn(
      tx,
      actor,
      site.id,
      DEMO_CLEAR_PRIORS[i]!.map((clearFraction, m) => ({
        month: m + 1,
        clearFraction,
        strengthNights: DEMO_PRIOR_STRENGTH,
      })),
    );
  return sites;
}

interface LoadContext {
  store: StoreContext;
  tx: DbOrTx;
  actor: Actor;
  rnd: ReturnType<typeof noise>;
  /**
   * Each target's own measurement errors: a block the limits close at one anchor and not at another
   * changes that target's later errors only, so the other stars keep their kept fits (fits.ts).
   */
  errors: (targetId: number) => ReturnType<typeof noise>;
  made: Made;
  counts: Counts;
  anchor: DemoAnchor;
  /** Site-nights already made (`siteId/date`). */
  usedNights: Set<string>;
}

async function demoCampaigns(
  store: StoreContext,
  tx: DbOrTx,
  actor: Actor,
  anchor: DemoAnchor,
  stars: Star[],
  lanternB: Star,
  sites: SiteRow[],
) {
  const passageYear = anchor.day(DEMO_DAYS.periapsis).slice(0, 4);
  const passage = await store.campaigns.createIn(tx, actor, {
    name: `Vesper Core passage ${passageYear}`,
    startDate: anchor.day(DEMO_DAYS.passageCampaign.start),
    endDate: anchor.day(DEMO_DAYS.passageCampaign.end),
    goals: {
      cadenceDays: 14,
      densifiedCadenceDays: 7,
      densifyWithinDays: 30,
      kinds: ['astrometry', 'spectroscopy'],
      laserGuideStar: { astrometry: true },
      // The slower stars are followed yearly (as their measurements are), at a lower priority.
      targets: Object.fromEntries(
        stars
          .filter((s) => s.target.name !== HEADLINE)
          .map((s) => [String(s.target.id), { cadenceDays: 365, priority: 0.5 }]),
      ),
    },
    limits: DEMO_LIMITS.passage,
    targetIds: stars.map((s) => s.target.id),
    siteIds: sites.map((s) => s.id),
    notes: `Follow ${HEADLINE} through its periapsis; keep the other stars on a yearly cadence.`,
  });
  const binary = await store.campaigns.createIn(tx, actor, {
    name: 'Lantern Pair orbit',
    startDate: anchor.day(DEMO_DAYS.binaryCampaign.start),
    endDate: anchor.day(DEMO_DAYS.binaryCampaign.end),
    goals: { cadenceDays: 21, kinds: ['astrometry'] },
    limits: DEMO_LIMITS.binary,
    targetIds: [lanternB.target.id],
    siteIds: [sites[1]!.id],
  });
  return { passage: passage.id, binary: binary.id };
}

function demoPlans(
  anchor: DemoAnchor,
  campaigns: { passage: number; binary: number },
  stars: Star[],
  lanternB: Star,
): Plan[] {
  const [headline, second] = [stars[0]!, stars[1]!];
  const of = (s: Star, kinds: Plan['targets'][number]['kinds']) => ({
    id: s.target.id,
    raDeg: s.raDeg,
    decDeg: s.decDeg,
    orbit: s.orbit,
    kinds,
  });
  const coming = [
    ...new Set([
      ...nightsOf(anchor, DEMO_DAYS.comingSeason),
      ...nightsOf(anchor, DEMO_DAYS.densified),
    ]),
  ].sort();
  return [
    {
      campaignId: campaigns.passage,
      limits: DEMO_LIMITS.passage,
      siteIndex: 0,
      dates: nightsOf(anchor, DEMO_DAYS.pastSeason),
      targets: [of(headline, ['astrometry', 'spectroscopy']), of(second, ['astrometry'])],
    },
    {
      campaignId: campaigns.passage,
      limits: DEMO_LIMITS.passage,
      siteIndex: 0,
      dates: coming,
      targets: [of(headline, ['astrometry', 'spectroscopy'])],
    },
    {
      campaignId: campaigns.passage,
      limits: DEMO_LIMITS.passage,
      siteIndex: 1,
      dates: nightsOf(anchor, DEMO_DAYS.secondSite),
      targets: [of(headline, ['spectroscopy'])],
    },
    {
      campaignId: campaigns.binary,
      limits: DEMO_LIMITS.binary,
      siteIndex: 1,
      dates: nightsOf(anchor, DEMO_DAYS.binarySeason),
      targets: [{ ...of(lanternB, ['astrometry']), speckle: true }],
    },
  ];
}

/** How a past night went: clear, cut short (the later blocks lost), or lost whole. */
function weather(ctx: LoadContext, date: string): { lostHours: number; cutAfter: number | null } {
  const bad =
    date >= ctx.anchor.day(DEMO_DAYS.badMonth.start) &&
    date <= ctx.anchor.day(DEMO_DAYS.badMonth.end);
  const u = ctx.rnd.uniform();
  if (u < (bad ? 0.8 : 0.15)) return { lostHours: 9.5, cutAfter: 0 };
  if (u < (bad ? 0.85 : 0.3))
    return { lostHours: Number((1 + 3 * ctx.rnd.uniform()).toFixed(1)), cutAfter: 1 };
  return { lostHours: 0, cutAfter: null };
}

async function loadPlan(ctx: LoadContext, site: SiteRow, plan: Plan): Promise<void> {
  const { store, tx, actor, counts, anchor } = ctx;
  const sky = validateSite(site);
  const limits = validateLimits({ ...plan.limits, lowestAltitudeDeg: site.lowestAltitudeDeg }, sky);
  // Blocks obey the campaign's limits as a planner's would: none where the Moon (or another limit) closes the target.
  const places = new Map(
    plan.targets.map((t) => [
      t.id,
      validateTarget({ name: 'demo', raDeg: t.raDeg, decDeg: t.decDeg }),
    ]),
  );
  const blockCount = plan.targets.reduce((n, t) => n + t.kinds.length, 0);
  /** The night's blocks as the demo lays them out, each with whether the limits leave it open. */
  const layouts = new Map<string, ReturnType<typeof layOut>>();
  const layout = (date: string) => {
    const known = layouts.get(date) ?? layOut(date);
    layouts.set(date, known);
    return known;
  };
  function layOut(date: string) {
    const moment = nightMoments(sky, limits, date);
    const first = runStart(site, date, plan.targets[0]!.raDeg, blockCount * 50);
    return plan.targets
      .flatMap((t) => t.kinds.map((kind) => ({ t, kind })))
      .map((b, k) => {
        const start = first.plus({ minutes: 50 * k });
        const ends = [start, start.plus({ minutes: 45 })].map((x) => unixMsToJd(x.toMillis()));
        return { ...b, start, open: ends.every((jd) => moment(places.get(b.t.id)!, jd).open) };
      });
  }
  // A 14-night pattern meets the Moon every other time (the sidereal month is 27.3 days): as a team
  // would, take the nearest night (up to 4 away, same side of today, not taken) where every block is open.
  const openDate = (asked: string): string => {
    for (const shift of [0, 1, -1, 2, -2, 3, -3, 4, -4]) {
      const d = addDays(asked, shift);
      if (ctx.usedNights.has(`${site.id}/${d}`) || d < anchor.today !== asked < anchor.today)
        continue;
      if (layout(d).every((b) => b.open)) return d;
    }
    return asked;
  };
  for (const asked of plan.dates) {
    const date = openDate(asked);
    ctx.usedNights.add(`${site.id}/${date}`);
    const night = await store.nights.createIn(tx, actor, {
      siteId: site.id,
      campaignId: plan.campaignId,
      date,
    });
    counts.nights++;
    const past = date < anchor.today;
    const w = past ? weather(ctx, date) : { lostHours: 0, cutAfter: null };
    const outcomes = [];
    let k = 0;
    for (const { t, kind, start, open } of layout(date)) {
      const lost = w.cutAfter !== null && k >= w.cutAfter;
      k++;
      if (!open) continue;
      const block = await store.blocks.createIn(tx, actor, {
        nightId: night.id,
        targetId: t.id,
        kind,
        startUtc: start.toUTC().toISO()!,
        endUtc: start.plus({ minutes: 45 }).toUTC().toISO()!,
        laserGuideStar: site.laserGuideStar && kind === 'astrometry',
        origin: 'season-plan', // the demo's nights stand for an earlier accepted plan, so a re-plan may replace their future blocks
      });
      counts.blocks++;
      if (!past) continue;
      outcomes.push({
        blockId: block.id,
        status: lost ? 'lost' : 'obtained',
        exposureMinutes: lost ? 0 : 40,
      });
      if (!lost)
        await addMeasurement(ctx, t, block.id, kind, start.plus({ minutes: 22 }).toUTC().toISO()!);
    }
    if (past) await addReport(ctx, site, night.id, w, outcomes);
  }
}
async function addReport(
  ctx: LoadContext,
  site: SiteRow,
  nightId: number,
  w: { lostHours: number; cutAfter: number | null },
  outcomes: { blockId: number; status: string; exposureMinutes: number }[],
): Promise<void> {
  const { rnd } = ctx;
  const whole = w.cutAfter === 0;
  await ctx.store.nightReports.createIn(ctx.tx, ctx.actor, {
    nightId,
    seeingArcsec: Number((0.45 + 0.5 * rnd.uniform()).toFixed(2)),
    strehlRatio: site.laserGuideStar ? Number((0.25 + 0.35 * rnd.uniform()).toFixed(2)) : null,
    cloudCoverPct: whole ? 90 : w.lostHours > 0 ? 60 : Math.round(20 * rnd.uniform()),
    humidityPct: whole ? 88 : Math.round(8 + 30 * rnd.uniform()),
    windMS: Number((w.lostHours > 0 && !whole ? 14 : 2 + 9 * rnd.uniform()).toFixed(1)),
    temperatureC: Number(((site.temperatureC ?? 5) - 3 + 4 * rnd.uniform()).toFixed(1)),
    timeLostHours: w.lostHours,
    timeLostReason: whole
      ? 'dome closed: humidity above the limit'
      : w.lostHours > 0
        ? 'dome closed early: wind above the limit'
        : '',
    notes: whole
      ? 'Fog from the valley all night.'
      : w.lostHours > 0
        ? 'Clear at first; wind rose after the first block.'
        : 'Stable night.',
    outcomes,
  });
  ctx.counts.reports++;
}

/** Epochs from earlier seasons, made before the campaign began: one a year near opposition. */
async function earlierEpochs(ctx: LoadContext, stars: Star[], lanternB: Star): Promise<void> {
  for (const s of stars)
    for (let k = 0; k <= 12; k++)
      await addMeasurement(
        ctx,
        { id: s.target.id, orbit: s.orbit },
        null,
        'astrometry',
        ctx.anchor.yearsFrom(-(k + 0.467)), // yearly, the last (k = 0) in the past season
      );
  for (let k = 1; k <= 14; k++)
    await addMeasurement(
      ctx,
      { id: lanternB.target.id, orbit: lanternB.orbit, speckle: true },
      null,
      'astrometry',
      ctx.anchor.yearsFrom(-(k - 0.05)),
    );
}

/**
 * The Brindle Pair, measured before the demo's campaigns: speckle positions every half year and,
 * every 0.37 year, one spectrum that gives the velocities of both stars (double-lined).
 */
async function doubleLinedEpochs(ctx: LoadContext, b: Star): Promise<void> {
  const t = { id: b.target.id, orbit: b.orbit, speckle: true };
  for (let k = 0; k < 14; k++)
    await addMeasurement(ctx, t, null, 'astrometry', ctx.anchor.yearsFrom(-(0.5 * k + 0.1)));
  for (let k = 0; k < 16; k++)
    for (const body of ['primary', 'secondary'] as const)
      await addMeasurement(
        ctx,
        t,
        null,
        'spectroscopy',
        ctx.anchor.yearsFrom(-(0.37 * k + 0.2)),
        body,
      );
}

/** Each star's fitted solution (fits.ts), stored as its current one. */
async function storeFits(
  ctx: LoadContext,
  stars: Star[],
  lanternB: Star,
  fitNow: boolean,
): Promise<void> {
  const all = [...stars, lanternB];
  const made = (s: Star) => ctx.made.get(s.target.id) ?? [];
  const fitStars = all.map((s) => ({ name: s.target.name, orbit: s.orbit, measurements: made(s) }));
  for (const { reference, solutions } of demoSolutions(fitStars, ctx.anchor, fitNow))
    for (const { name, orbit } of solutions) {
      const s = all.find((t) => t.target.name === name)!;
      await ctx.store.orbitSolutions.createIn(ctx.tx, ctx.actor, {
        targetId: s.target.id,
        orbit,
        provenance: 'fitted',
        fittedFrom: made(s).map((m) => m.id),
        reference,
        makeCurrent: true,
      });
    }
}

async function addMeasurement(
  ctx: LoadContext,
  t: Pick<PlanTarget, 'id' | 'orbit' | 'speckle'>,
  blockId: number | null,
  kind: BlockKind,
  epoch: string,
  body?: 'primary' | 'secondary',
): Promise<void> {
  const rnd = ctx.errors(t.id);
  const p = predict(validateOrbit(t.orbit), unixMsToJd(Date.parse(epoch)));
  const round = (x: number, d: number) => Number(x.toFixed(d));
  const base = { targetId: t.id, blockId, epoch };
  const input = body
    ? {
        ...base,
        kind: 'radial-velocity',
        component: body,
        radialVelocityKmS: round(
          (body === 'primary' ? p.primaryRadialVelocityKmS! : p.secondaryRadialVelocityKmS!) +
            0.6 * rnd.gauss(),
          2,
        ),
        sigmaRadialVelocityKmS: 0.6,
        instrument: INSTRUMENTS.echelle,
      }
    : kind === 'spectroscopy'
      ? {
          ...base,
          kind: 'radial-velocity',
          radialVelocityKmS: round(p.radialVelocityKmS! + 12 * rnd.gauss(), 1),
          sigmaRadialVelocityKmS: 12,
          instrument: INSTRUMENTS.spectrograph,
        }
      : t.speckle
        ? {
            ...base,
            kind: 'separation',
            separationMas: round(p.separationMas + 2 * rnd.gauss(), 1),
            positionAngleDeg: round((p.positionAngleDeg + 0.3 * rnd.gauss() + 360) % 360, 2),
            sigmaSeparationMas: 2,
            sigmaPositionAngleDeg: 0.3,
            instrument: INSTRUMENTS.speckle,
          }
        : {
            ...base,
            kind: 'offsets',
            dRaMas: round(p.dRaMas + 0.4 * rnd.gauss(), 2),
            dDecMas: round(p.dDecMas + 0.4 * rnd.gauss(), 2),
            sigmaDRaMas: 0.4,
            sigmaDDecMas: 0.4,
            correlation: 0.1,
            instrument: INSTRUMENTS.imager,
          };
  const row = await ctx.store.measurements.createIn(ctx.tx, ctx.actor, input);
  ctx.made.set(t.id, [...(ctx.made.get(t.id) ?? []), row]);
  ctx.counts.measurements++;
}
