/**
 * `epochwright allocate`: a campaign's allocated nights in bulk, from a pattern, a CSV file or a
 * telescope's iCalendar schedule; a preview night by night, then (--accept) all of them or none.
 * The store reads the sources and judges each night (store/allocations/), as for the HTTP API.
 */
import type { AllocationPreview, AllocationRequest, NightRow, SiteRow } from '../../store/index.ts';
import { asOptions, commandArgs, type outputFormat, positiveId, readTextFile } from '../args.ts';
import { UsageError, type Command } from '../io.ts';
import { formatTable, plural, render, type Column } from '../output.ts';
import { STORE_HELP, storeAction, storeOptions, type StoreValues } from './store-option.ts';

const help = `usage: epochwright allocate --campaign-id <id>        (the nights it has, with their ids)
       epochwright allocate --campaign-id <id> --site-id <id> --start <date> --end <date>
                          [--weekdays <list>] [--step <duration>] [--semester <label>] [--accept]
       epochwright allocate --campaign-id <id> --csv-file <file> [--accept]
       epochwright allocate --campaign-id <id> --site-id <id> --calendar-file <file.ics>
                          [--match <text>] [--semester <label>] [--accept]

The site-nights a campaign has been given, night by night: new, already the campaign's, or
refused with the reason (another campaign's night, a site not in the campaign, a date outside
it). Nothing is written unless --accept is given; then every new night is stored, or none when any
night is refused.

sources:
  a pattern              --site-id, --start and --end (local evening dates, both included; at most
                         three years), on --weekdays (1–7 or mon,tue,…,sun; default every day),
                         one night per --step from --start (ISO 8601 whole days: P2D every
                         second night; default P1D)
  --csv-file <file>      a CSV with a header row: site (a stored site's name or id), date
                         (YYYY-MM-DD, the evening's local date), semester (optional)
  --calendar-file <file> an iCalendar file (RFC 5545) of the telescope's schedule for --site-id:
                         each event gives the nights of the local evenings it overlaps (an all-day
                         event its dates); recurring events are expanded to the campaign's end;
                         --match keeps only events whose summary or description contains the text

options:
  --semester <label>     label given to every night (a semester, a run)
  --accept               store the new nights (all or none)
${STORE_HELP}
  --json | --csv         machine-readable output instead of a table
`;

const DAYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'];

/** `1,3,5` or `mon,wed,fri` (ISO 8601 weekdays, Monday 1). */
function weekdaysOf(text: string): number[] {
  return text.split(',').map((w) => {
    const t = w.trim().toLowerCase();
    const n = /^[1-7]$/.test(t) ? Number(t) : DAYS.indexOf(t.slice(0, 3)) + 1;
    if (n < 1 || (!/^[1-7]$/.test(t) && !DAYS.some((d) => t.startsWith(d))))
      throw new UsageError(
        `--weekdays: ${JSON.stringify(w)} must be 1–7 (Monday 1) or one of ${DAYS.join(', ')}`,
      );
    return n;
  });
}

/** The campaign's stored nights, with the ids blocks and reports name them by. */
async function storedNights(
  values: StoreValues,
  campaignId: number,
  format: ReturnType<typeof outputFormat>,
): Promise<string> {
  const nights = await storeAction(values, {
    local: async (store) => (await store.nights.list({ campaignId }, { limit: 500 })).items,
    remote: async (api) =>
      (
        await api<{ items: NightRow[] }>({
          method: 'GET',
          path: '/nights',
          query: { campaignId, limit: 500 },
        })
      ).items,
  });
  const sites = await storeAction(values, {
    local: async (store) => (await store.sites.list({}, { limit: 500 })).items,
    remote: async (api) =>
      (await api<{ items: SiteRow[] }>({ method: 'GET', path: '/sites', query: { limit: 500 } }))
        .items,
  });
  const site = new Map(sites.map((s) => [s.id, s.name]));
  const columns: Column<NightRow>[] = [
    { header: 'night_id', value: (n) => n.id },
    { header: 'night', value: (n) => n.date },
    { header: 'site', value: (n) => site.get(n.siteId) ?? `site ${n.siteId}` },
    { header: 'semester', value: (n) => n.semester },
  ];
  if (format === 'table' && nights.length === 0)
    return (
      `campaign ${campaignId} has no allocated nights yet: give a pattern, --csv-file or ` +
      `--calendar-file (see --help)\n`
    );
  return render(format, nights, columns, nights);
}

type Answer = AllocationPreview & { created?: NightRow[] };

export const allocateCommand: Command = {
  summary: 'a campaign’s allocated nights from a pattern, a CSV or an iCalendar file (all or none)',
  help,
  async run(argv) {
    const { values, format } = commandArgs(argv, {
      ...storeOptions,
      'campaign-id': { type: 'string' },
      'site-id': { type: 'string' },
      start: { type: 'string' },
      end: { type: 'string' },
      weekdays: { type: 'string' },
      step: { type: 'string' },
      semester: { type: 'string' },
      'csv-file': { type: 'string' },
      'calendar-file': { type: 'string' },
      match: { type: 'string' },
      accept: { type: 'boolean' },
    });
    const campaignId = positiveId('campaign-id', values['campaign-id']);
    const sources = [
      values['csv-file'] !== undefined,
      values['calendar-file'] !== undefined,
      values.start !== undefined || values.end !== undefined,
    ].filter(Boolean).length;
    if (sources === 0) return storedNights(values, campaignId, format);
    if (sources !== 1)
      throw new UsageError(
        'give one source: a pattern (--site-id, --start, --end), --csv-file or --calendar-file',
      );
    const semester = values.semester === undefined ? {} : { semester: values.semester };
    let request: AllocationRequest;
    if (values['csv-file'] !== undefined) {
      for (const o of ['site-id', 'semester', 'weekdays', 'step', 'match'] as const)
        if (values[o] !== undefined)
          throw new UsageError(`--${o} does not go with --csv-file (the file names each night)`);
      request = { source: 'csv', text: readTextFile('csv-file', values['csv-file']) };
    } else if (values['calendar-file'] !== undefined) {
      request = {
        source: 'calendar',
        siteId: positiveId('site-id', values['site-id']),
        text: readTextFile('calendar-file', values['calendar-file']),
        ...(values.match === undefined ? {} : { match: values.match }),
        ...semester,
      };
    } else {
      if (values.start === undefined || values.end === undefined)
        throw new UsageError('a pattern needs --start and --end (local evening dates, YYYY-MM-DD)');
      request = {
        source: 'pattern',
        siteId: positiveId('site-id', values['site-id']),
        start: values.start,
        end: values.end,
        ...(values.weekdays === undefined ? {} : { weekdays: weekdaysOf(values.weekdays) }),
        ...(values.step === undefined ? {} : { step: values.step }),
        ...semester,
      };
    }
    const options = {
      start: '--start',
      end: '--end',
      siteId: '--site-id',
      weekdays: '--weekdays',
      step: '--step',
      semester: '--semester',
      match: '--match',
      text: request.source === 'csv' ? '--csv-file' : '--calendar-file',
    };
    const answer = await asOptions(options, () =>
      storeAction<Answer>(values, {
        local: (store, actor) =>
          values.accept
            ? store.allocations.accept(actor, campaignId, request)
            : store.allocations.preview(campaignId, request),
        remote: {
          method: 'POST',
          path: `/campaigns/${campaignId}/allocations${values.accept ? '' : '/preview'}`,
          body: request,
        },
        writes: values.accept === true,
      }),
    );
    type Night = Answer['nights'][number];
    const columns: Column<Night>[] = [
      { header: 'night', value: (n) => n.date },
      { header: 'site', value: (n) => n.site },
      { header: 'semester', value: (n) => n.semester },
      { header: 'state', value: (n) => n.state },
      { header: 'night_id', value: (n) => n.nightId },
      { header: 'found_in', value: (n) => n.foundIn },
      { header: 'reason', value: (n) => n.reason ?? '' },
    ];
    if (format !== 'table') return render(format, answer.nights, columns, answer);
    const c = answer.counts;
    const tail = answer.created
      ? `stored ${plural(answer.created.length, 'night')} for campaign ${campaignId}\n`
      : c.refused > 0
        ? `preview only: ${plural(c.refused, 'night')} refused, so --accept would store nothing; fix or ` +
          `leave them out\n`
        : c.new > 0
          ? `preview only: run again with --accept to store the ${plural(c.new, 'new night')}\n`
          : 'nothing new to store\n';
    return (
      `${plural(c.new, 'new night')}, ${c.allocated} already allocated, ${c.refused} ` +
      `refused\n\n${formatTable(answer.nights, columns)}\n${tail}`
    );
  },
};
