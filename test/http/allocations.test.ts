/**
 * Allocated nights in bulk through the API, on both backends: a pattern, a CSV file and a
 * telescope's iCalendar schedule previewed (nothing written), then stored all or none; a refused
 * night names itself and its reason and leaves every table as it was. The calendar's nights are
 * checked against node-ical, a second iCalendar parser from the registry, for the events it reads
 * without recurrence.
 */
import ical from 'node-ical';
import { DateTime } from 'luxon';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS, fixture, tableCounts, type Fixture } from '../store/backends.ts';

// biome-ignore lint/suspicious/noExplicitAny: loose JSON answers read field by field in this test
type Json = Record<string, any>;

/** The telescope's schedule (constructed case): Test Ridge keeps America/Santiago, UTC−4 in May and June 2027. */
const CALENDAR = [
  'BEGIN:VCALENDAR',
  'VERSION:2.0',
  'PRODID:-//constructed test schedule//EN',
  'BEGIN:VEVENT',
  'UID:run-1@test',
  'DTSTAMP:20270101T000000Z',
  'SUMMARY:Vesper programme, run 1',
  'DTSTART;TZID=America/Santiago:20270503T193000',
  'DTEND;TZID=America/Santiago:20270504T063000',
  'END:VEVENT',
  'BEGIN:VEVENT',
  'UID:run-2@test',
  'DTSTAMP:20270101T000000Z',
  'SUMMARY:Vesper programme, run 2 (three nights)',
  'DTSTART;VALUE=DATE:20270510',
  'DTEND;VALUE=DATE:20270513',
  'END:VEVENT',
  'BEGIN:VEVENT',
  'UID:run-3@test',
  'DTSTAMP:20270101T000000Z',
  'SUMMARY:Vesper programme, run 3',
  'DTSTART:20270520T230000Z',
  'DTEND:20270521T090000Z',
  'END:VEVENT',
  'BEGIN:VEVENT',
  'UID:other@test',
  'DTSTAMP:20270101T000000Z',
  'SUMMARY:Another team’s programme',
  'DTSTART;VALUE=DATE:20270525',
  'DTEND;VALUE=DATE:20270526',
  'END:VEVENT',
  'BEGIN:VEVENT',
  'UID:cancelled@test',
  'DTSTAMP:20270101T000000Z',
  'SUMMARY:Vesper programme, cancelled run',
  'STATUS:CANCELLED',
  'DTSTART;VALUE=DATE:20270527',
  'DTEND;VALUE=DATE:20270528',
  'END:VEVENT',
  'BEGIN:VEVENT',
  'UID:weekly@test',
  'DTSTAMP:20270101T000000Z',
  'SUMMARY:Vesper programme, weekly',
  'DTSTART:20270601T200000',
  'DTEND:20270602T050000',
  'RRULE:FREQ=WEEKLY;COUNT=3',
  'END:VEVENT',
  'END:VCALENDAR',
  '',
].join('\r\n');

for (const backend of BACKENDS) {
  describe(`allocations in bulk (${backend.name})`, () => {
    let env: Awaited<ReturnType<(typeof backend)['open']>>;
    let f: Fixture;
    const post = async (path: string, body: unknown, role: 'lead' | 'observer' = 'lead') => {
      const res = await f.call(role, 'POST', `/api/campaigns/${f.ids.campaign}${path}`, body);
      return { status: res.status, body: (await res.json()) as Json };
    };
    beforeAll(async () => {
      env = await backend.open();
      f = await fixture(env.store);
    });
    afterAll(() => env.cleanup());

    it('a pattern of weekdays: previewed, then stored with its semester label, then already there', async () => {
      // March 2027 begins on a Monday (constructed case: 2027-01-01 is a Friday, ISO 8601 calendar).
      const pattern = {
        source: 'pattern',
        siteId: f.ids.site,
        start: '2027-03-01',
        end: '2027-03-31',
        weekdays: [5, 6],
        semester: '2027A',
      };
      const before = await tableCounts(env.store);
      const p = await post('/allocations/preview', pattern);
      expect(p.status).toBe(200);
      expect(p.body.nights.map((n: Json) => n.date)).toEqual([
        '2027-03-05',
        '2027-03-06',
        '2027-03-12',
        '2027-03-13',
        '2027-03-19',
        '2027-03-20',
        '2027-03-26',
        '2027-03-27',
      ]);
      expect(await tableCounts(env.store)).toEqual(before);
      const s = await post('/allocations', pattern);
      expect(s.status).toBe(201);
      expect(s.body.created).toHaveLength(8);
      expect(s.body.created.every((n: Json) => n.semester === '2027A')).toBe(true);
      const again = await post('/allocations', pattern);
      expect(again.body.counts).toEqual({ new: 0, allocated: 8, refused: 0 });
      expect(again.body.created).toHaveLength(0);
    });

    it('one night per ISO 8601 step, both ends included', async () => {
      const p = await post('/allocations/preview', {
        source: 'pattern',
        siteId: f.ids.site,
        start: '2027-04-01',
        end: '2027-04-10',
        step: 'P3D',
      });
      expect(p.body.nights.map((n: Json) => n.date)).toEqual([
        '2027-04-01',
        '2027-04-04',
        '2027-04-07',
        '2027-04-10',
      ]); // constructed case: every third evening from the first
      const pattern = {
        source: 'pattern',
        siteId: f.ids.site,
        start: '2027-04-01',
        end: '2027-04-10',
      };
      const half = await post('/allocations/preview', { ...pattern, step: 'PT36H' });
      expect(half.status).toBe(422);
      expect(half.body.error.details).toMatchObject({ field: 'step', value: 'PT36H' });
      expect((await post('/allocations/preview', { ...pattern, step: '3d' })).status).toBe(422);
      expect((await post('/allocations/preview', { ...pattern, everyNights: 3 })).status).toBe(400); // the earlier name is not a key
    });

    it('one refused night stores none, and the refusal names the night and the rule', async () => {
      const before = await tableCounts(env.store);
      const body = {
        source: 'csv',
        text: 'site,date,semester\nTest Ridge,2027-12-30,2027B\nTest Ridge,2028-01-02,2027B\n',
      };
      const p = await post('/allocations/preview', body);
      expect(p.body.counts).toEqual({ new: 1, allocated: 0, refused: 1 });
      expect(p.body.nights[1]).toMatchObject({
        date: '2028-01-02',
        state: 'refused',
        reason: expect.stringMatching(/outside the campaign’s dates 2026-01-01 to 2027-12-31/),
        foundIn: 'CSV line 3',
      });
      const s = await post('/allocations', body);
      expect(s.status).toBe(422);
      expect(s.body.error.details.rule).toMatch(/night of 2028-01-02.*nothing was stored/);
      expect(await tableCounts(env.store)).toEqual(before);
      // A row that cannot be read is reported with its line and column before anything else.
      const bad = await post('/allocations/preview', {
        source: 'csv',
        text: 'site,date\nNowhere Peak,2027-05-01\nTest Ridge,2027-5-1\n',
      });
      expect(bad.status).toBe(422);
      expect(bad.body.error.details.problems.map((x: Json) => x.field)).toEqual([
        'line 2, site',
        'line 3, date',
      ]);
      // Observers read a preview but do not allocate.
      expect((await post('/allocations', body, 'observer')).status).toBe(403);
    });

    it('the telescope’s iCalendar schedule, filtered to the programme (checked against node-ical)', async () => {
      const body = {
        source: 'calendar',
        siteId: f.ids.site,
        text: CALENDAR,
        match: 'vesper',
        semester: '2027A',
      };
      const p = await post('/allocations/preview', body);
      expect(p.status).toBe(200);
      const dates = p.body.nights.map((n: Json) => n.date);
      expect(dates).toEqual([
        '2027-05-03',
        '2027-05-10',
        '2027-05-11',
        '2027-05-12',
        '2027-05-20',
        '2027-06-01',
        '2027-06-08',
        '2027-06-15',
      ]);
      // node-ical's reading of the events without recurrence gives the same evenings.
      const zone = 'America/Santiago';
      const evening = (d: Date) =>
        DateTime.fromJSDate(d, { zone }).minus({ hours: 12 }).toISODate();
      const seen: string[] = [];
      for (const c of Object.values(ical.sync.parseICS(CALENDAR))) {
        if (c?.type !== 'VEVENT') continue;
        const e = c as ical.VEvent;
        if (e.rrule || e.status === 'CANCELLED') continue;
        if (!String(e.summary).toLowerCase().includes('vesper')) continue;
        if (e.datetype === 'date') {
          const s = DateTime.fromJSDate(e.start).toISODate()!;
          const n = Math.round(
            DateTime.fromJSDate(e.end!).diff(DateTime.fromJSDate(e.start), 'days').days,
          );
          for (let k = 0; k < n; k++) seen.push(DateTime.fromISO(s).plus({ days: k }).toISODate()!);
        } else seen.push(evening(e.start)!);
      }
      expect(seen.sort()).toEqual(dates.filter((d: string) => d < '2027-06-01'));
      const s = await post('/allocations', body);
      expect(s.status).toBe(201);
      expect(s.body.created).toHaveLength(8);
    });

    it('a file that is not a calendar, and a request too large, are refused before any work', async () => {
      const notCal = await post('/allocations/preview', {
        source: 'calendar',
        siteId: f.ids.site,
        text: 'site,date\n',
      });
      expect(notCal.status).toBe(422);
      expect(notCal.body.error.details.field).toBe('text');
      const many = await post('/allocations/preview', {
        source: 'pattern',
        siteId: f.ids.site,
        start: '2024-01-01',
        end: '2029-12-31',
      });
      expect(many.status).toBe(422);
      expect(many.body.error.details.rule).toMatch(/within three years/);
      const unknown = await post('/allocations/preview', { source: 'fax', text: 'x' });
      expect(unknown.status).toBe(400);
    });
  });
}
