/**
 * The campaign calendar feed on the demo campaign, read back by two independent iCalendar parsers
 * from the registry (node-ical and ical.js): stable host-independent UIDs, SEQUENCE and DTSTAMP
 * of each change, LOCATION with GEO, one event per allocated site-night in local time, periapsis
 * as ± 1σ, flags only with a date of their own, and read-only feed tokens.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ICAL from 'ical.js';
import ical from 'node-ical';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/http/app.ts';
import { eventsWithUncertainty, validateOrbit } from '../../server/science/orbit/index.ts';
import { nightSpan, sunNight, validateSite } from '../../server/science/sky/index.ts';
import { jdToUnixMs, parseEpoch } from '../../server/science/time/index.ts';
import { asOf, nowIso } from '../../server/clock.ts';
import { revision } from '../../server/store/exports/calendar.ts';
import { HEADLINE, demoAnchor } from '../../server/store/demo/scenario.ts';
import { LOCAL_OPERATOR, type Store } from '../../server/store/index.ts';
import { startStore } from '../../server/store/startup.ts';

const demo = demoAnchor(nowIso());
let dir: string;
let store: Store;
let leadToken: string;
let app: ReturnType<typeof createApp>;
beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'epochwright-feed-'));
  const started = await startStore({ url: `file:${join(dir, 'demo.db')}`, demo: true });
  store = started.store;
  leadToken = started.firstLead!.secret;
  app = createApp({ store });
});
afterAll(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

const feed = async (host: string, token = leadToken) => {
  const res = await app.request(`http://${host}/api/campaigns/1/calendar.ics?token=${token}`);
  expect(res.status, await res.clone().text()).toBe(200);
  return res.text();
};
const events = (text: string) =>
  Object.values(ical.sync.parseICS(text)).filter((c) => c?.type === 'VEVENT') as ical.VEvent[];

describe('the campaign calendar feed', () => {
  it('is the same from any host, line by line RFC 5545, with unique UIDs', async () => {
    const text = await feed('127.0.0.1');
    expect(await feed('localhost')).toBe(text); // UIDs and stamps from the store only
    const lines = text.split('\r\n');
    expect(text.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/); // RFC 5545 §3.1: lines end in CRLF
    expect(Math.max(...lines.map((l) => Buffer.byteLength(l, 'utf8')))).toBeLessThanOrEqual(75); // RFC 5545 §3.1: at most 75 octets
    const parsed = events(text);
    expect(new Set(parsed.map((e) => e.uid)).size).toBe(parsed.length); // RFC 5545 §3.8.4.7
    expect(parsed.every((e) => !e.uid.includes('127.0.0.1'))).toBe(true);
  });

  it('has one event per allocated site-night, in local time, placed alike by both parsers', async () => {
    const text = await feed('127.0.0.1');
    const nights = (await store.nights.list({}, { limit: 500 })).items.filter(
      (n) => n.campaignId === 1,
    );
    const nightEvents = events(text).filter((e) => String(e.summary).startsWith('Night at'));
    expect(nightEvents.length).toBe(nights.length); // demo sites are at −30°: every night has darkness
    const root = new ICAL.Component(ICAL.parse(text));
    for (const tz of root.getAllSubcomponents('vtimezone')) ICAL.TimezoneService.register(tz);
    const byUid = new Map(
      root.getAllSubcomponents('vevent').map((v) => {
        const e = new ICAL.Event(v);
        return [e.uid, e] as const;
      }),
    );
    let worstS = 0;
    for (const n of nights.slice(0, 12)) {
      const ev = nightEvents.find(
        (e) =>
          String(e.summary).endsWith(`(${n.date})`) &&
          String(e.location).length > 0 &&
          e.uid.startsWith(`night-${n.id}-`),
      )!;
      const siteRow = await store.sites.get(n.siteId);
      expect(String(ev.location)).toBe(siteRow.name);
      expect(ev.geo).toEqual({ lat: siteRow.latitudeDeg, lon: siteRow.longitudeDeg }); // RFC 5545 §3.8.1.6 GEO
      const viaIcalJs = byUid.get(ev.uid)!;
      expect(viaIcalJs.startDate.zone?.tzid).toBe(siteRow.timeZone); // DTSTART;TZID= the site's zone
      // astronomical dusk from astronomy-engine's search (through sunNight), independent of both parsers
      const site = validateSite(siteRow);
      const dusk = jdToUnixMs(sunNight(site, nightSpan(site, n.date)).dusk.astronomical!);
      for (const at of [new Date(ev.start).getTime(), viaIcalJs.startDate.toJSDate().getTime()])
        worstS = Math.max(worstS, Math.abs(at - dusk) / 1000);
    }
    console.log(
      `site-night starts vs astronomy-engine dusk, both parsers: worst ${worstS.toFixed(1)} s`,
    );
    expect(worstS).toBeLessThan(1); // iCalendar carries whole seconds
  });

  it('shows periapsis as ± 1σ around the most likely instant, and no flag that repeats it', async () => {
    const text = await feed('127.0.0.1');
    const parsed = events(text);
    const ev = parsed.find((e) => String(e.summary).startsWith(`Periapsis of ${HEADLINE}`))!;
    const target = (await store.targets.list({}, { limit: 50 })).items.find(
      (t) => t.name === HEADLINE,
    )!;
    const solution = (await store.orbitSolutions.list({}, { limit: 200 })).items.find(
      (s) => s.targetId === target.id && s.current,
    )!;
    const start = parseEpoch(`${demo.today}T00:00:00Z`) - 400;
    const [passage] = eventsWithUncertainty(validateOrbit(solution.orbit), start, start + 800, {
      kinds: ['periapsis'],
    }).filter((e) => e.jd > start + 400);
    const mid = (new Date(ev.start!).getTime() + new Date(ev.end!).getTime()) / 2;
    const half = (new Date(ev.end!).getTime() - new Date(ev.start!).getTime()) / 2;
    expect(Math.abs(mid - jdToUnixMs(passage!.jd))).toBeLessThan(1000); // the orbit engine's passage
    expect(Math.abs(half - passage!.sigmaDays! * 86_400_000)).toBeLessThan(1000); // its linear 1σ
    expect(String(ev.description)).toMatch(/Most likely at \d{4}-\d\d-\d\d \d\d:\d\d UTC, 1σ/);
    // SEQUENCE: whole seconds from the event's creation (its target's) to its last change
    const created = Math.floor(Date.parse(target.createdAt) / 1000);
    expect(Number(ev.sequence)).toBeGreaterThanOrEqual(
      Math.floor(Date.parse(solution.createdAt) / 1000) - created,
    );
    expect(parsed.filter((e) => /^Flag|periapsis ahead|stale/i.test(String(e.summary)))).toEqual(
      [],
    );
  });

  it('raises a changed block’s SEQUENCE and dates its DTSTAMP at the change', async () => {
    const before = events(await feed('127.0.0.1'));
    const ours = new Set(
      (await store.nights.list({}, { limit: 500 })).items
        .filter((n) => n.campaignId === 1)
        .map((n) => n.id),
    );
    const planned = (await store.blocks.list({}, { limit: 500 })).items.filter(
      (b) => b.status === 'planned' && ours.has(b.nightId),
    );
    const uidOf = (list: ical.VEvent[], id: number) =>
      list.find((e) => e.uid.startsWith(`block-${id}-`))!;
    // The first planned block that the store's rules let move 10 minutes later (inside darkness,
    // clear of its neighbours); a refused move writes nothing, so the next one is tried.
    let moved: Awaited<ReturnType<typeof store.blocks.update>> | undefined;
    for (const b of planned) {
      moved = await store.blocks
        .update(
          LOCAL_OPERATOR,
          b.id,
          {
            startUtc: new Date(Date.parse(b.startUtc) + 600_000).toISOString(),
            endUtc: new Date(Date.parse(b.endUtc) + 600_000).toISOString(),
          },
          b.version,
        )
        .catch(() => undefined);
      if (moved) break;
    }
    expect(moved).toBeDefined();
    const was = uidOf(before, moved!.id);
    const now = uidOf(events(await feed('127.0.0.1')), moved!.id);
    expect(now.uid).toBe(was.uid); // the same event, updated in place
    expect(Number(now.sequence)).toBeGreaterThan(Number(was.sequence)); // RFC 5545 §3.8.7.4
    expect(new Date(now.dtstamp).getTime()).toBe(
      Math.floor(Date.parse(moved!.updatedAt) / 1000) * 1000,
    );
    expect(new Date(now.start!).getTime() - new Date(was.start!).getTime()).toBe(600_000);
    expect(String(now.location)).not.toBe('');
  });
});

describe('a rename of what an event shows', () => {
  it('keeps the UID and raises SEQUENCE and DTSTAMP of its blocks and passages', async () => {
    const target = (await store.targets.list({}, { limit: 50 })).items.find(
      (t) => t.name === HEADLINE,
    )!;
    const before = events(await feed('127.0.0.1'));
    const shows = (list: ical.VEvent[]) =>
      list.filter(
        (e) =>
          e.uid.startsWith(`periapsis-t${target.id}-`) ||
          String(e.summary).startsWith(`${target.name} (`),
      );
    expect(shows(before).length).toBeGreaterThan(1); // a passage and at least one block
    // Two minutes after the clock, so the change lies in a later second than any other (constructed case).
    const at = Math.ceil(Date.now() / 1000) * 1000 + 120_000;
    await asOf(at, () => store.targets.update(LOCAL_OPERATOR, target.id, { name: 'Renamed Kite' }));
    const after = events(await feed('127.0.0.1'));
    for (const was of shows(before)) {
      const now = after.find((e) => e.uid === was.uid)!;
      expect(now, was.uid).toBeDefined(); // the same event, updated in place
      expect(String(now.summary)).toContain('Renamed Kite');
      expect(Number(now.sequence), was.uid).toBeGreaterThan(Number(was.sequence)); // RFC 5545 §3.8.7.4
      expect(new Date(now.dtstamp).getTime()).toBe(at); // RFC 5545 §3.8.7.2: the last revision
    }
    await store.targets.update(LOCAL_OPERATOR, target.id, { name: target.name });
  });

  it('never lowers SEQUENCE when a row moves under another with fewer changes', () => {
    // constructed case: a block moved from a much-edited night to a fresh one
    const created = '2027-01-01T00:00:00.000Z';
    const before = revision(created, ['2027-03-01T00:00:00.000Z', '2027-02-01T00:00:00.000Z'], 2);
    const after = revision(created, ['2027-03-02T00:00:00.000Z', '2027-01-01T00:00:00.000Z'], 3);
    expect(after.sequence).toBeGreaterThan(before.sequence);
    expect(after.stamp.getTime()).toBeGreaterThan(before.stamp.getTime());
    expect(revision(created, [created]).sequence).toBe(0); // RFC 5545 §3.8.7.4: 0 when created
  });
});

describe('feed tokens', () => {
  it('open one campaign’s feed read-only, nothing else, until revoked', async () => {
    const res = await app.request('/api/campaigns/1/feed-tokens', {
      method: 'POST',
      headers: { authorization: `Bearer ${leadToken}`, 'content-type': 'application/json' },
      body: JSON.stringify({ label: 'team calendar' }),
    });
    expect(res.status).toBe(201);
    const { token, tokenId, feedPath } = (await res.json()) as {
      token: string;
      tokenId: number;
      feedPath: string;
    };
    expect(feedPath).toBe(`/api/campaigns/1/calendar.ics?token=${token}`);
    expect((await app.request(feedPath)).status).toBe(200);
    for (const path of ['/api/campaigns/1', '/api/systems', '/api/campaigns/2/calendar.ics'])
      expect(
        (await app.request(path, { headers: { authorization: `Bearer ${token}` } })).status,
        path,
      ).toBe(403);
    const revoked = await app.request(`/api/tokens/${tokenId}`, {
      method: 'DELETE',
      headers: { authorization: `Bearer ${leadToken}` },
    });
    expect(revoked.status).toBe(204);
    expect((await app.request(feedPath)).status).toBe(401);
  });
});
