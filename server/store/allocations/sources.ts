/**
 * Where a campaign's allocated nights come from, read into site-nights (no database here): a
 * pattern (a site, a date range, some weekdays or every N nights, a semester label), a CSV file
 * (`site,date,semester`), or the telescope's schedule as an iCalendar file (RFC 5545).
 *
 * A night is named by the local date on which its evening falls (DESIGN.md), so an instant
 * belongs to the night of the local date 12 h before it at the site: an event from 19:00 to
 * 06:00 local is one night, the evening's; an all-day event covers the nights of each date from
 * its start up to, not including, its end date (RFC 5545 §3.6.1: DTEND is exclusive).
 */
import { parse } from 'csv-parse/sync';
import ICAL from 'ical.js';
import { DateTime } from 'luxon';
import { InputError } from '../../science/errors.ts';
import { parseDurationDays } from '../../science/time/index.ts';

/** One site-night a source asks for, and where in the source it came from (for the preview). */
export interface AllocationLine {
  siteId: number;
  date: string;
  semester: string;
  foundIn: string;
}

/** More nights than this in one request is refused before any work (about three years at two sites). */
export const MOST_NIGHTS_PER_REQUEST = 2000;

const dateOf = (field: string, s: string) => {
  const d = DateTime.fromISO(s, { zone: 'UTC' });
  if (!/^\d{4}-\d{2}-\d{2}$/.test(s) || !d.isValid)
    throw new InputError(field, s, 'must be a calendar date YYYY-MM-DD');
  return d;
};

function bounded(lines: AllocationLine[], field: string): AllocationLine[] {
  if (lines.length > MOST_NIGHTS_PER_REQUEST)
    throw new InputError(
      field,
      lines.length,
      `asks for ${lines.length} nights: at most ${MOST_NIGHTS_PER_REQUEST} in one request; split it by semester`,
    );
  return lines;
}

export interface NightPattern {
  siteId: number;
  start: string;
  end: string;
  /** ISO 8601 weekdays of the evening (1 Monday … 7 Sunday); default every day. */
  weekdays?: number[] | undefined;
  /** Spacing of the nights from `start`, an ISO 8601 duration in whole days (P2D: every second night); default P1D. */
  step?: string | undefined;
  semester?: string | undefined;
}

/** A pattern's step in nights: an ISO 8601 duration of whole days, P1D to P366D. */
function nightStep(step: string): number {
  const days = parseDurationDays(step, 'step', { atLeast: 'P1D', atMost: 'P366D' });
  if (!Number.isInteger(days))
    throw new InputError('step', step, 'must be whole days (nights), e.g. P1D or P2D');
  return days;
}

/** The nights of a pattern: from `start` to `end` (both included), on its weekdays, one per step. */
export function patternNights(p: NightPattern): AllocationLine[] {
  const first = dateOf('start', p.start);
  const last = dateOf('end', p.end);
  if (last < first) throw new InputError('end', p.end, `must not be before start ${p.start}`);
  const span = last.diff(first, 'days').days;
  if (span > 3 * 366) throw new InputError('end', p.end, 'must lie within three years of start');
  const every = p.step === undefined ? 1 : nightStep(p.step);
  const days = new Set(p.weekdays ?? [1, 2, 3, 4, 5, 6, 7]);
  const out: AllocationLine[] = [];
  for (let k = 0; k <= span; k += every) {
    const d = first.plus({ days: k });
    if (days.has(d.weekday))
      out.push({
        siteId: p.siteId,
        date: d.toISODate()!,
        semester: p.semester ?? '',
        foundIn: 'pattern',
      });
  }
  return bounded(out, 'end');
}

/**
 * A CSV file of nights: a header row, then `site` (a stored site's name or id), `date`
 * (YYYY-MM-DD, the evening's local date) and an optional `semester` per row. Every bad row is
 * reported (line, column, value, rule) before anything is written.
 */
export function csvNights(
  text: string,
  sites: readonly { id: number; name: string }[],
): AllocationLine[] {
  let rows: Record<string, string>[];
  try {
    rows = parse(text.replace(/^\uFEFF/, ''), {
      columns: (h: string[]) => h.map((c) => c.trim().toLowerCase()),
      skip_empty_lines: true,
      trim: true,
    }) as Record<string, string>[];
  } catch (e) {
    throw new InputError('text', null, `is not a readable CSV file: ${(e as Error).message}`);
  }
  const header = Object.keys(rows[0] ?? {});
  for (const need of ['site', 'date'])
    if (rows.length && !header.includes(need))
      throw new InputError(
        'text',
        header.join(','),
        `needs a "${need}" column (columns: site, date, semester)`,
      );
  const extra = header.filter((h) => !['site', 'date', 'semester'].includes(h));
  if (extra.length)
    throw new InputError(
      'text',
      extra.join(','),
      'has columns this layout does not know (site, date, semester)',
    );
  const byName = new Map(sites.map((s) => [s.name.toLowerCase(), s.id]));
  const byId = new Set(sites.map((s) => s.id));
  const problems: { field: string; value: unknown; rule: string }[] = [];
  const out: AllocationLine[] = [];
  rows.forEach((r, i) => {
    const line = i + 2;
    const site = r.site ?? '';
    const siteId =
      /^\d+$/.test(site) && byId.has(Number(site)) ? Number(site) : byName.get(site.toLowerCase());
    if (siteId === undefined)
      problems.push({
        field: `line ${line}, site`,
        value: site,
        rule: 'names no stored site (give its name or id)',
      });
    const date = r.date ?? '';
    if (!/^\d{4}-\d{2}-\d{2}$/.test(date) || !DateTime.fromISO(date).isValid)
      problems.push({
        field: `line ${line}, date`,
        value: date,
        rule: 'must be a calendar date YYYY-MM-DD (the evening’s local date)',
      });
    if (siteId !== undefined && !problems.some((p) => p.field.startsWith(`line ${line},`)))
      out.push({ siteId, date, semester: r.semester ?? '', foundIn: `CSV line ${line}` });
  });
  if (problems.length) {
    const [p] = problems;
    throw new InputError(p!.field, p!.value, p!.rule, problems);
  }
  return bounded(out, 'text');
}

export interface CalendarOptions {
  siteId: number;
  /** The site's IANA zone: evenings are named on its clock, and floating times are read in it. */
  timeZone: string;
  /** Keep only events whose summary or description contains this text (any case); default all. */
  match?: string | undefined;
  semester?: string | undefined;
  /** Recurring events are expanded up to this date (YYYY-MM-DD, included). */
  until: string;
}

/** The instant of an iCalendar time: UTC, a zone defined in the file, an IANA TZID, or floating on the site's clock. */
function instantMs(t: ICAL.Time, tzid: string | null, siteZone: string): number {
  const zone = t.zone;
  if (
    zone === ICAL.Timezone.utcTimezone ||
    (zone && zone !== ICAL.Timezone.localTimezone && zone.tzid !== 'floating' && zone.component)
  )
    return t.toUnixTime() * 1000;
  const named = tzid && DateTime.local().setZone(tzid).isValid ? tzid : siteZone;
  return DateTime.fromObject(
    { year: t.year, month: t.month, day: t.day, hour: t.hour, minute: t.minute, second: t.second },
    { zone: named },
  ).toMillis();
}

const eveningOf = (msUtc: number, zone: string) =>
  DateTime.fromMillis(msUtc, { zone }).minus({ hours: 12 }).toISODate()!;

/** The nights an event's occurrence covers, by the rule in this module's comment. */
function occurrenceNights(
  start: ICAL.Time,
  end: ICAL.Time,
  tzids: [string | null, string | null],
  zone: string,
): string[] {
  const out: string[] = [];
  if (start.isDate) {
    const first = DateTime.fromObject(
      { year: start.year, month: start.month, day: start.day },
      { zone: 'UTC' },
    );
    const stop = DateTime.fromObject(
      { year: end.year, month: end.month, day: end.day },
      { zone: 'UTC' },
    );
    for (let d = first; d < stop || d.equals(first); d = d.plus({ days: 1 }))
      out.push(d.toISODate()!);
    return out;
  }
  const s = instantMs(start, tzids[0], zone);
  const e = Math.max(s + 1, instantMs(end, tzids[1] ?? tzids[0], zone));
  const last = eveningOf(e - 1, zone);
  for (
    let d = eveningOf(s, zone);
    d <= last;
    d = DateTime.fromISO(d).plus({ days: 1 }).toISODate()!
  )
    out.push(d);
  return out;
}

/** The nights an iCalendar file (a telescope's schedule) gives the campaign at one site. */
export function calendarNights(text: string, o: CalendarOptions): AllocationLine[] {
  let root: ICAL.Component;
  try {
    root = new ICAL.Component(ICAL.parse(text));
  } catch (e) {
    throw new InputError(
      'text',
      null,
      `is not a readable iCalendar file (RFC 5545): ${(e as Error).message}`,
    );
  }
  if (root.name !== 'vcalendar')
    throw new InputError('text', root.name, 'must be a VCALENDAR (RFC 5545)');
  for (const tz of root.getAllSubcomponents('vtimezone')) ICAL.TimezoneService.register(tz);
  const want = o.match?.trim().toLowerCase();
  const until = DateTime.fromISO(o.until, { zone: 'UTC' }).plus({ days: 2 });
  const out: AllocationLine[] = [];
  let occurrences = 0;
  for (const v of root.getAllSubcomponents('vevent')) {
    const ev = new ICAL.Event(v);
    if (String(v.getFirstPropertyValue('status') ?? '').toUpperCase() === 'CANCELLED') continue;
    const words = `${ev.summary ?? ''} ${ev.description ?? ''}`.toLowerCase();
    if (want && !words.includes(want)) continue;
    if (!ev.startDate)
      throw new InputError('text', ev.summary ?? ev.uid, 'has an event without DTSTART');
    const tzids: [string | null, string | null] = [
      (v.getFirstProperty('dtstart')?.getParameter('tzid') as string | undefined) ?? null,
      (v.getFirstProperty('dtend')?.getParameter('tzid') as string | undefined) ?? null,
    ];
    const label = `calendar event “${ev.summary || ev.uid}”`;
    const add = (start: ICAL.Time, end: ICAL.Time) => {
      for (const date of occurrenceNights(start, end, tzids, o.timeZone)) {
        if (++occurrences > MOST_NIGHTS_PER_REQUEST) bounded(new Array(occurrences), 'text');
        out.push({ siteId: o.siteId, date, semester: o.semester ?? '', foundIn: label });
      }
    };
    if (!ev.isRecurring()) {
      add(ev.startDate, ev.endDate ?? ev.startDate);
      continue;
    }
    const it = ev.iterator();
    for (let next = it.next(); next; next = it.next()) {
      if (
        DateTime.fromObject(
          { year: next.year, month: next.month, day: next.day },
          { zone: 'UTC' },
        ) > until
      )
        break;
      const d = ev.getOccurrenceDetails(next);
      add(d.startDate, d.endDate);
    }
  }
  return bounded(out, 'text');
}
