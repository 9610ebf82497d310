/**
 * The season plan and the night schedule of the demo campaign through the API, on both backends:
 * previews write nothing; accepting stores exactly the plan, replacing only blocks that are still
 * plans; every stored block passes astronomy-engine's checks of darkness, altitude, airmass, Moon
 * and Sun; bad input and stale previews leave the database as it was.
 *
 * Demo scenario (server/store/demo/scenario.ts, invented): campaign 1 follows the Vesper Core stars
 * from Tolvane Ridge (site 1, laser guide star) and Ostrel Summit (site 2); its headline star passes
 * periapsis about seven months after the clock; every date below is read from the demo
 * (server/store/demo/scenario.ts). Limits: airmass ≤ 1.8, Moon ≥ 30°, astronomical darkness; Sun avoidance 45°/40°.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LASER_GUIDE_STAR_CAUTION, PLAN_ADVISORY } from '../../server/science/plan/index.ts';
import { LOCAL_OPERATOR } from '../../server/store/index.ts';
import { asOf, nowIso } from '../../server/clock.ts';
import { findEvents, validateOrbit } from '../../server/science/orbit/index.ts';
import { parseEpoch } from '../../server/science/time/index.ts';
import {
  DEMO_DAYS,
  HEADLINE,
  SITES,
  demoAnchor,
  vesperSystem,
} from '../../server/store/demo/scenario.ts';
import { createApp } from '../../server/http/app.ts';
import { BACKENDS, tableCounts } from '../store/backends.ts';
import { skyMargins } from './block-sky.ts';
import { nowMs } from '../../server/clock.ts';

// Previews are made as of the demo's day; an accept may not reach back in time, so it runs at the server's clock (no `at`).
const demo = demoAnchor(nowIso());
/** A day `n` days from the headline periapsis (the demo's calendar). */
const near = (n: number) => demo.day(DEMO_DAYS.periapsis + n);
const VESPER = vesperSystem(demo);
const AT = `${demo.today}T00:00:00Z`;
const RANGE = { startDate: near(-13), endDate: near(16), at: AT };
const ACCEPT = { startDate: RANGE.startDate, endDate: RANGE.endDate };

// biome-ignore lint/suspicious/noExplicitAny: loose JSON answers read field by field in this test
type Json = Record<string, any>;

for (const backend of BACKENDS) {
  describe(`planning writes (${backend.name})`, () => {
    let env: Awaited<ReturnType<(typeof backend)['open']>>;
    let call: (
      role: 'lead' | 'observer' | 'viewer',
      method: string,
      path: string,
      body?: unknown,
    ) => Promise<Response>;
    beforeAll(async () => {
      env = await backend.open();
      await env.store.loadDemo(LOCAL_OPERATOR, {});
      const tokens = {
        lead: (
          await env.store.users.createWithToken(LOCAL_OPERATOR, { name: 'plan lead', role: 'lead' })
        ).secret,
        observer: (
          await env.store.users.createWithToken(LOCAL_OPERATOR, {
            name: 'plan observer',
            role: 'observer',
          })
        ).secret,
        viewer: (
          await env.store.users.createWithToken(LOCAL_OPERATOR, {
            name: 'plan viewer',
            role: 'viewer',
          })
        ).secret,
      };
      const app = createApp({ store: env.store });
      call = async (role, method, path, body) =>
        app.request(path, {
          method,
          headers: { authorization: `Bearer ${tokens[role]}`, 'content-type': 'application/json' },
          ...(body === undefined ? {} : { body: JSON.stringify(body) }),
        });
    });
    afterAll(() => env.cleanup());

    const campaignBlocks = async (from: string, to: string) => {
      const nights = (await env.store.nights.list({}, { limit: 500 })).items.filter(
        (n) => n.campaignId === 1 && n.date >= from && n.date <= to,
      );
      const blocks = (await env.store.blocks.list({}, { limit: 500 })).items.filter((b) =>
        nights.some((n) => n.id === b.nightId),
      );
      return { nights, blocks };
    };
    const checkSky = (siteId: number, blocks: { startUtc: string; endUtc: string }[]) => {
      const site = SITES[siteId - 1]!;
      const m = skyMargins(site, VESPER.raDeg, VESPER.decDeg, blocks);
      console.log(
        `${site.name}: ${m.edges} block edges; Sun ≤ ${m.highestSunDeg.toFixed(1)}°, altitude ≥ ${m.lowestAltitudeDeg.toFixed(2)}°, airmass ≤ ${m.highestAirmass.toFixed(3)}, Moon ≥ ${m.closestMoonDeg.toFixed(1)}°, Sun ≥ ${m.closestSunDeg.toFixed(1)}° away`,
      );
      expect(m.highestSunDeg).toBeLessThan(-18); // astronomical darkness (Explanatory Supplement to the Astronomical Almanac, via docs/REFERENCES.md); Sun from astronomy-engine
      expect(m.highestAirmass).toBeLessThan(1.8 + 0.01); // the demo campaign's limit; Kasten & Young, Applied Optics 28, 4735 (1989), on astronomy-engine's altitude (0.01: its standard refraction vs the site's pressure)
      expect(m.lowestAltitudeDeg).toBeGreaterThan(site.lowestAltitudeDeg - 0.05); // the site's altitude limit (demo, invented)
      expect(m.closestMoonDeg).toBeGreaterThan(30 - 0.1); // the campaign's Moon limit (demo); 0.1°: the target is placed at its primary here
      expect(m.closestSunDeg).toBeGreaterThan(site.leastSunDistanceDeg); // the site's Sun-avoidance angle (demo)
    };

    it('previews a season plan without writing, with reasons, unmet goals and shrinking σ', async () => {
      const before = await tableCounts(env.store);
      const res = await call('viewer', 'POST', '/api/campaigns/1/season-plan', RANGE);
      expect(res.status, await res.clone().text()).toBe(200);
      const body = (await res.json()) as Json;
      expect(await tableCounts(env.store)).toEqual(before); // a preview writes nothing
      expect(body.plan.epochs.length).toBeGreaterThan(0);
      for (const e of body.plan.epochs) expect(e.reason).toMatch(/gap|tightens|periapsis window/);
      for (const u of body.plan.unmet) expect(u.reason.length).toBeGreaterThan(20);
      const s1 = body.plan.targets.find((t: Json) => t.target === HEADLINE);
      const fitted = (await env.store.orbitSolutions.list({})).items.find(
        (x) => x.current && x.targetId === 1,
      )!; // the headline star's current (fitted) solution
      const [next] = findEvents(validateOrbit(fitted.orbit), parseEpoch(AT), parseEpoch(AT) + 365, {
        kinds: ['periapsis'],
      });
      expect(Math.abs(parseEpoch(s1.periapses[0]) - parseEpoch(next!.epoch))).toBeLessThan(1); // the orbit engine's passage of the stored solution, Rømer delay within a day
      expect(s1.shrinkage.periapsisDays.after).toBeLessThan(s1.shrinkage.periapsisDays.before); // epochs add information, so σ can only shrink (Fisher information is additive; common practice, no source)
      expect(body.plan.cautions).toEqual([PLAN_ADVISORY, LASER_GUIDE_STAR_CAUTION]);
      const { blocks } = await campaignBlocks(RANGE.startDate, RANGE.endDate);
      expect([...body.replaces].sort()).toEqual(blocks.map((b) => b.id).sort()); // the demo's June blocks are all still plans
    });

    it('accepts the plan as blocks (lead only), exactly as previewed, in darkness and within limits', async () => {
      const preview = (await (
        await call('viewer', 'POST', '/api/campaigns/1/season-plan', RANGE)
      ).json()) as Json;
      const before = await tableCounts(env.store);
      expect(
        (
          await call('observer', 'POST', '/api/campaigns/1/season-plan/accept', {
            ...ACCEPT,
            digest: preview.digest,
          })
        ).status,
      ).toBe(403); // a season plan is the lead's (store roles)
      expect(await tableCounts(env.store)).toEqual(before);
      const outside = await campaignBlocks(near(17), near(139));
      const res = await call('lead', 'POST', '/api/campaigns/1/season-plan/accept', {
        ...ACCEPT,
        digest: preview.digest,
      });
      expect(res.status, await res.clone().text()).toBe(201);
      const body = (await res.json()) as Json;
      const { blocks } = await campaignBlocks(RANGE.startDate, RANGE.endDate);
      const stored = blocks.map((b) => `${b.startUtc} ${b.kind}`).sort();
      expect(stored).toEqual(
        preview.plan.epochs
          .map((e: Json) => `${e.block.start.utc.replace('Z', '.000Z')} ${e.kind}`)
          .sort(),
      ); // the preview, block for block
      expect(blocks.some((b) => preview.replaces.includes(b.id))).toBe(false);
      expect((await campaignBlocks(near(17), near(139))).blocks).toEqual(outside.blocks); // nights outside the range untouched
      expect(blocks.filter((b) => b.laserGuideStar).every((b) => b.kind === 'astrometry')).toBe(
        true,
      );
      for (const siteId of [1, 2]) {
        const nights = (await env.store.nights.list({}, { limit: 500 })).items
          .filter((n) => n.siteId === siteId)
          .map((n) => n.id);
        checkSky(
          siteId,
          blocks.filter((b) => nights.includes(b.nightId)),
        );
      }
      expect(body.written.length).toBe(preview.plan.epochs.length);
    });

    it('re-plans after a logged night: keeps its blocks, replaces the other plans; a stale digest writes nothing', async () => {
      const { nights, blocks } = await campaignBlocks(near(-9), near(-9));
      const night = nights[0]!;
      const mine = blocks.filter((b) => b.nightId === night.id);
      // A report waits for its night to end: written on a clock moved to the day after it.
      await asOf(Date.parse(`${near(-7)}T00:00:00Z`), () =>
        env.store.nightReports.create(LOCAL_OPERATOR, {
          nightId: night.id,
          seeingArcsec: 0.6,
          outcomes: mine.map((b) => ({ blockId: b.id, status: 'obtained', exposureMinutes: 30 })),
        }),
      );
      const stale = await call('lead', 'POST', '/api/campaigns/1/season-plan/accept', {
        ...ACCEPT,
        digest: '0000000000000000',
      });
      expect(stale.status).toBe(409); // the plan changed since that preview: RFC 9110 §15.5.10 Conflict (from memory)
      const preview = (await (
        await call('viewer', 'POST', '/api/campaigns/1/season-plan', RANGE)
      ).json()) as Json;
      expect(preview.sites[0].skipped).toContainEqual({
        date: near(-9),
        reason: 'the night has a report',
      });
      const res = await call('lead', 'POST', '/api/campaigns/1/season-plan/accept', {
        ...ACCEPT,
        digest: preview.digest,
      });
      expect(res.status, await res.clone().text()).toBe(201);
      const after = (await env.store.blocks.list({}, { limit: 500 })).items.filter(
        (b) => b.nightId === night.id,
      );
      expect(after.map((b) => [b.id, b.status])).toEqual(mine.map((b) => [b.id, 'obtained'])); // the logged night is kept as it was
    });

    it('plans every night of a range with nights: "all", creating the nights it uses', async () => {
      const body = { startDate: near(17), endDate: near(26), siteIds: [2], nights: 'all' };
      const res = await call('lead', 'POST', '/api/campaigns/1/season-plan/accept', body);
      expect(res.status, await res.clone().text()).toBe(201);
      const out = (await res.json()) as Json;
      expect(out.nightsCreated.length).toBe(new Set(out.plan.epochs.map((e: Json) => e.date)).size); // one new night per planned date (Ostrel Summit has no stored July nights in the demo)
      for (const n of out.nightsCreated) expect([n.siteId, n.campaignId]).toEqual([2, 1]);
      checkSky(2, out.written);
    });

    it('refuses bad season input naming the field, writing nothing', async () => {
      const before = await tableCounts(env.store);
      const cases: [unknown, number, string][] = [
        [{ ...ACCEPT, startDate: demo.day(-334) }, 422, 'startDate'],
        [{ ...ACCEPT, siteIds: [1, 99] }, 422, 'siteIds.1'],
        [{ ...ACCEPT, fillFraction: 2 }, 422, 'fillFraction'],
        [{ ...ACCEPT, blockMinutes: { astrometry: -5 } }, 422, 'blockMinutes.astrometry'],
        [{ ...ACCEPT, nights: 'some' }, 422, 'nights'], // a choice outside its list: a value that breaks a rule
        [{ ...ACCEPT, colour: 'red' }, 400, '(body)'],
        [{ ...ACCEPT, at: 'soon' }, 422, 'at'],
        [RANGE, 422, 'at'], // a past moment: accepting may not replace blocks begun since then
      ];
      for (const [body, status, field] of cases) {
        const res = await call('lead', 'POST', '/api/campaigns/1/season-plan/accept', body);
        const err = ((await res.json()) as Json).error;
        expect(res.status, JSON.stringify(err)).toBe(status); // 422 a value breaks a rule, 400 malformed (docs/DESIGN.md errors)
        expect(err.details.field ?? err.details.issues[0].field).toBe(field);
      }
      expect(
        (await call('lead', 'POST', '/api/campaigns/77/season-plan/accept', ACCEPT)).status,
      ).toBe(404);
      expect(await tableCounts(env.store)).toEqual(before); // nothing written by any of them
    });

    it('schedules a stored night: every block placed or left out with its reason, laser caution, pins and removals', async () => {
      const { nights } = await campaignBlocks(near(-2), near(-2));
      const id = nights.find((n) => n.siteId === 1)!.id;
      const before = await tableCounts(env.store);
      const res = await call('viewer', 'POST', `/api/nights/${id}/schedule`, { at: AT });
      expect(res.status, await res.clone().text()).toBe(200);
      const s = ((await res.json()) as Json).schedule;
      expect(await tableCounts(env.store)).toEqual(before);
      expect(s.blocks.length + s.leftOut.length).toBe(8); // 4 demo targets × 2 goal kinds
      for (const l of s.leftOut) expect(l.reason.length).toBeGreaterThan(10);
      for (const b of s.blocks)
        expect(b.cautions).toEqual(b.laserGuideStar ? [LASER_GUIDE_STAR_CAUTION] : []);
      expect(s.blocks.some((b: Json) => b.laserGuideStar)).toBe(true); // astrometry at Tolvane Ridge uses the laser (demo)
      const first = s.blocks[0];
      const pinAt = new Date(
        Date.parse(s.blocks.at(-1).end.utc) - first.minutes * 60_000,
      ).toISOString();
      const edited = (await (
        await call('viewer', 'POST', `/api/nights/${id}/schedule`, {
          at: AT,
          pins: [{ id: first.id, start: pinAt }],
          remove: ['Sorrel:spectroscopy'],
        })
      ).json()) as Json;
      const moved = edited.schedule.blocks.find((b: Json) => b.id === first.id);
      expect([moved.start.utc, moved.pinned]).toEqual([pinAt.replace('.000Z', 'Z'), true]); // moved to the pinned start (a slot edge)
      expect(edited.schedule.leftOut).toContainEqual({
        id: 'Sorrel:spectroscopy',
        target: 'Sorrel',
        kind: 'spectroscopy',
        reason: 'removed by the user',
      });
    });

    it('accepts a night schedule (observer) in place of its planned blocks, planning around kept blocks', async () => {
      const { nights } = await campaignBlocks(near(5), near(5)); // a night near new Moon (demo calendar at the frozen clock)
      const id = nights.find((n) => n.siteId === 1)!.id;
      const preview = (await (
        await call('viewer', 'POST', `/api/nights/${id}/schedule`, { at: AT })
      ).json()) as Json;
      expect((await call('viewer', 'POST', `/api/nights/${id}/schedule/accept`, {})).status).toBe(
        403,
      );
      const res = await call('observer', 'POST', `/api/nights/${id}/schedule/accept`, {
        digest: preview.digest,
      });
      expect(res.status, await res.clone().text()).toBe(201);
      const stored = (await env.store.blocks.list({}, { limit: 500 })).items.filter(
        (b) => b.nightId === id,
      );
      expect(stored.map((b) => b.startUtc).sort()).toEqual(
        preview.schedule.blocks.map((b: Json) => b.start.utc.replace('Z', '.000Z')).sort(),
      );
      checkSky(1, stored);
      expect(stored.every((b) => b.origin === 'night-schedule' && !b.pinned)).toBe(true); // written by the scheduler, nothing pinned in this request
      // Withdraw one stored block: it is kept, and the next schedule plans around it.
      const w = stored[0]!;
      await env.store.blocks.update(LOCAL_OPERATOR, w.id, { status: 'withdrawn' }, w.version);
      const again = await call('observer', 'POST', `/api/nights/${id}/schedule/accept`, {});
      expect(again.status, await again.clone().text()).toBe(201);
      const kept = (await env.store.blocks.list({}, { limit: 500 })).items.filter(
        (b) => b.nightId === id,
      );
      expect(kept.find((b) => b.id === w.id)?.status).toBe('withdrawn');
      for (const b of kept.filter((x) => x.id !== w.id))
        expect(
          Date.parse(b.endUtc) <= Date.parse(w.startUtc) ||
            Date.parse(b.startUtc) >= Date.parse(w.endUtc),
        ).toBe(true); // no new block overlaps the kept one
      const before = await tableCounts(env.store);
      const bad = await call('observer', 'POST', `/api/nights/${id}/schedule/accept`, {
        pins: [{ id: `${HEADLINE}:astrometry`, start: `${near(6)}T18:00:00Z` }],
      });
      expect(bad.status).toBe(422);
      expect(((await bad.json()) as Json).error.details.field).toBe('pins.0.start');
      expect(await tableCounts(env.store)).toEqual(before);
    });

    const targetId = async (name: string) =>
      (await env.store.targets.list({}, { limit: 50 })).items.find((t) => t.name === name)!.id;
    const nightOf = async (date: string, siteId: number) =>
      (await campaignBlocks(date, date)).nights.find((n) => n.siteId === siteId)!;

    it('keeps hand-made and pinned blocks through a season re-plan, planning new blocks around them on their nights', async () => {
      // July at Tolvane Ridge still holds the demo's own blocks (written as an earlier season plan, scenario.ts).
      const JULY = { startDate: near(17), endDate: near(47), siteIds: [1] };
      const { nights, blocks } = await campaignBlocks(JULY.startDate, JULY.endDate);
      const n03 = nights.find((n) => n.date === near(19) && n.siteId === 1)!;
      const n10 = nights.find((n) => n.date === near(26) && n.siteId === 1)!;
      const slot = blocks.find((b) => b.nightId === n03.id)!;
      const body = {
        nightId: n03.id,
        targetId: await targetId(HEADLINE),
        kind: 'astrometry',
        startUtc: slot.startUtc,
        endUtc: slot.endUtc,
        // It takes the plan block's slot until the re-plan replaces that one.
        overlapReason: 'stands in for the planned block of this slot',
      };
      const before = await tableCounts(env.store);
      expect(
        (await call('observer', 'POST', '/api/blocks', { ...body, origin: 'season-plan' })).status,
      ).toBe(400); // the origin is the server's to set: an unknown key (docs/DESIGN.md errors)
      expect(await tableCounts(env.store)).toEqual(before);
      const made = await call('observer', 'POST', '/api/blocks', body);
      expect(made.status, await made.clone().text()).toBe(201);
      const hand = (await made.json()) as Json;
      expect([hand.origin, hand.pinned]).toEqual(['by-hand', false]); // made through the API by a person, not pinned unless asked
      expect(
        (
          await call('observer', 'PATCH', `/api/blocks/${hand.id}`, {
            origin: 'season-plan',
            version: hand.version,
          })
        ).status,
      ).toBe(400); // set once, never patched
      // Pin a block a plan wrote, on another night.
      const target = blocks.find((b) => b.nightId === n10.id)!;
      expect(target.origin).toBe('season-plan');
      const pinned = await call('observer', 'PATCH', `/api/blocks/${target.id}`, {
        pinned: true,
        version: target.version,
      });
      expect(pinned.status, await pinned.clone().text()).toBe(200);
      expect(((await pinned.json()) as Json).origin).toBe('season-plan'); // pinning does not change who made it

      const preview = (await (
        await call('viewer', 'POST', '/api/campaigns/1/season-plan', { ...JULY, at: AT })
      ).json()) as Json;
      expect(preview.sites.flatMap((s: Json) => s.skipped).map((k: Json) => k.date)).not.toContain(
        near(19),
      ); // planned around, no longer left out
      const around = preview.sites.flatMap((s: Json) => s.plannedAround);
      expect(around).toContainEqual({
        date: near(19),
        kept: [{ id: hand.id, reason: 'it was made by hand' }],
      });
      expect(around).toContainEqual({
        date: near(26),
        kept: [{ id: target.id, reason: 'a person pinned it' }],
      });
      expect(preview.replaces).not.toContain(hand.id);
      expect(preview.replaces).not.toContain(target.id);
      const res = await call('lead', 'POST', '/api/campaigns/1/season-plan/accept', {
        ...JULY,
        digest: preview.digest,
      });
      expect(res.status, await res.clone().text()).toBe(201);
      const out = (await res.json()) as Json;
      expect(out.replaces.length).toBeGreaterThan(0); // the other July nights' demo blocks were still plans
      expect(out.written.every((b: Json) => b.origin === 'season-plan' && b.pinned === false)).toBe(
        true,
      ); // a plan's blocks, nobody pinned them
      const after = (await env.store.blocks.list({}, { limit: 500 })).items;
      expect(after.find((b) => b.id === hand.id)).toMatchObject({
        origin: 'by-hand',
        version: hand.version,
      }); // untouched
      expect(after.find((b) => b.id === target.id)).toMatchObject({
        pinned: true,
        startUtc: target.startUtc,
      });
      // The hand-made block's night gets new blocks in the time it leaves free: none over it or inside the changeover gap, none repeating its target and kind.
      const added = out.written.filter((b: Json) => b.nightId === n03.id) as Json[];
      console.log(
        `${near(19)}: ${added.length} new blocks around hand-made block ${hand.id} (${hand.startUtc}–${hand.endUtc})`,
      );
      expect(added.length).toBeGreaterThan(0);
      for (const [kept, nightId] of [
        [hand, n03.id],
        [target, n10.id],
      ] as const) {
        const keptTarget = kept.targetId;
        for (const b of out.written.filter((x: Json) => x.nightId === nightId) as Json[]) {
          const gap = (b.targetId === keptTarget ? 3 : 8) * 60_000; // the scheduler's default changeover gaps (night-schedule.ts; common practice, no source)
          expect(
            Date.parse(b.endUtc) + gap <= Date.parse(kept.startUtc) ||
              Date.parse(kept.endUtc) + gap <= Date.parse(b.startUtc),
            `block ${b.id} ${b.startUtc}–${b.endUtc}`,
          ).toBe(true);
          expect([b.targetId, b.kind], `block ${b.id}`).not.toEqual([keptTarget, kept.kind]); // a kept block of the target and kind is that night's epoch: no repeat
        }
      }
      checkSky(1, added as { startUtc: string; endUtc: string }[]);
      const stayed = after
        .filter((b) => b.nightId === n03.id || b.nightId === n10.id)
        .map((b) => b.id)
        .sort((a, b) => a - b);
      expect(stayed).toEqual(
        [
          hand.id,
          target.id,
          ...out.written
            .filter((b: Json) => b.nightId === n03.id || b.nightId === n10.id)
            .map((b: Json) => b.id),
        ].sort((a, b) => a - b),
      ); // on those nights: the kept blocks and the new plan's, the demo's plans replaced
      expect(after.find((b) => b.id === hand.id)).toEqual(hand); // the hand-made block unchanged, every field
    });

    it('schedules a night around a hand-made block, leaving out a second block of its target and kind; pins are stored and kept', async () => {
      const night = await nightOf(near(-2), 1); // clear of the Moon (06-19 is not: the Moon limit leaves every block out)
      const first = (
        (await (
          await call('viewer', 'POST', `/api/nights/${night.id}/schedule`, { at: AT })
        ).json()) as Json
      ).schedule.blocks[0];
      const hand = await env.store.blocks.create(LOCAL_OPERATOR, {
        nightId: night.id,
        targetId: await targetId(HEADLINE),
        kind: 'astrometry',
        startUtc: first.start.utc,
        endUtc: first.end.utc,
        overlapReason: 'stands in for the planned block of this slot',
      });
      const preview = (await (
        await call('viewer', 'POST', `/api/nights/${night.id}/schedule`, { at: AT })
      ).json()) as Json;
      expect(preview.kept).toContainEqual({ id: hand.id, reason: 'it was made by hand' });
      expect(preview.schedule.leftOut).toContainEqual({
        id: `${HEADLINE}:astrometry`,
        target: HEADLINE,
        kind: 'astrometry',
        reason: `already has a kept block of this kind tonight (block ${hand.id})`,
      });
      const [hs, he] = [Date.parse(hand.startUtc), Date.parse(hand.endUtc)];
      for (const b of preview.schedule.blocks) {
        const gap = (b.target === HEADLINE ? 3 : 8) * 60_000; // the scheduler's default changeover gaps (night-schedule.ts; common practice, no source)
        expect(
          Date.parse(b.end.utc) + gap <= hs || he + gap <= Date.parse(b.start.utc),
          `${b.id} ${b.start.utc}–${b.end.utc}`,
        ).toBe(true);
      }
      const before = await tableCounts(env.store);
      const cases: [unknown, string, RegExp][] = [
        [
          { pins: [{ id: `${HEADLINE}:astrometry`, start: first.start.utc }] },
          'pins.0.id',
          /already has a kept block of this kind tonight/,
        ],
        [
          { pins: [{ id: 'Morrow:astrometry', start: first.start.utc }] },
          'pins.0.start',
          new RegExp(`over block ${hand.id}`),
        ],
        [
          { at: new Date(nowMs() - 3 * 60_000).toISOString() },
          'at',
          /must not be earlier than the server's clock less 2 min/,
        ], // 3 min back, beyond plan-scope.ts's 2 min allowance
      ];
      for (const [body, field, message] of cases) {
        const res = await call('observer', 'POST', `/api/nights/${night.id}/schedule/accept`, body);
        const err = ((await res.json()) as Json).error;
        expect([res.status, err.details.field], err.message).toEqual([422, field]);
        expect(err.message).toMatch(message);
      }
      expect(await tableCounts(env.store)).toEqual(before); // nothing written by any of them

      // Pin one proposed block and accept 1 min behind the clock (inside the 2 min allowance): stored as pinned.
      const pick = preview.schedule.blocks.at(-1);
      const res = await call('observer', 'POST', `/api/nights/${night.id}/schedule/accept`, {
        at: new Date(nowMs() - 60_000).toISOString(),
        pins: [{ id: pick.id, start: pick.start.utc }],
      });
      expect(res.status, await res.clone().text()).toBe(201);
      const written = ((await res.json()) as Json).written as Json[];
      expect(written.map((b) => [b.origin, b.pinned, b.startUtc])).toContainEqual([
        'night-schedule',
        true,
        pick.start.utc.replace('Z', '.000Z'),
      ]);
      expect(written.filter((b) => b.pinned).length).toBe(1); // only the one pinned in the request
      const pinnedId = written.find((b) => b.pinned)!.id;
      const next = (await (
        await call('viewer', 'POST', `/api/nights/${night.id}/schedule`, {})
      ).json()) as Json;
      expect(next.kept).toContainEqual({ id: pinnedId, reason: 'a person pinned it' });
      expect(next.kept).toContainEqual({ id: hand.id, reason: 'it was made by hand' });
      expect(next.replaces).not.toContain(pinnedId);
      expect(next.schedule.leftOut).toContainEqual({
        id: pick.id,
        target: pick.target,
        kind: pick.kind,
        reason: `already has a kept block of this kind tonight (block ${pinnedId})`,
      });
    });

    it('lists the planning routes in the OpenAPI document', async () => {
      const doc = (await (await call('viewer', 'GET', '/api/openapi.json')).json()) as Json;
      for (const p of [
        '/campaigns/{id}/season-plan',
        '/campaigns/{id}/season-plan/accept',
        '/nights/{id}/schedule',
        '/nights/{id}/schedule/accept',
      ])
        expect(Object.keys(doc.paths)).toContain(p);
    });

    it('explains Sun-avoidance refusals when the targets are near the Sun', async () => {
      // Early December the Sun passes within a few degrees of Vesper Core (RA 263.8°, Dec −21.7°, invented).
      const night = await env.store.nights.create(LOCAL_OPERATOR, {
        siteId: 1,
        campaignId: 1,
        date: demo.day(9),
      });
      const s = (
        (await (
          await call('viewer', 'POST', `/api/nights/${night.id}/schedule`, { at: AT })
        ).json()) as Json
      ).schedule;
      expect(s.blocks).toEqual([]);
      for (const l of s.leftOut)
        expect(l.reason).toMatch(/inside the Sun-avoidance angle \(\d+° from the Sun, limit 45°\)/); // Tolvane Ridge's 45° (demo)
      const res = await call('observer', 'POST', `/api/nights/${night.id}/schedule/accept`, {
        pins: [{ id: `${HEADLINE}:astrometry`, start: `${demo.day(10)}T04:00:00Z` }],
      });
      expect(res.status).toBe(422);
      // At 01:00 local the target is also low: the refusal names the limit that closes the block's
      // span first (the Sun's angle, darkness or the airmass limit), never just "refused".
      expect(((await res.json()) as Json).error.message).toMatch(
        /closed by (inside the Sun-avoidance angle|above the airmass limit|no darkness)|not inside darkness/,
      );
    });
  });
}
