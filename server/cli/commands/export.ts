/** `epochwright export`: measurements (CSV in the import layout, or JSON), or a stored target's ephemeris. */
import { parseArgs } from 'node:util';
import { ephemeris } from '../../science/orbit/index.ts';
import { parseEpoch } from '../../science/time/index.ts';
import { resolveEpochs } from '../../science/time/index.ts';
import { ephemerisCsv, measurementsCsv } from '../../store/index.ts';
import { optionalId } from '../args.ts';
import { UsageError, type Command } from '../io.ts';
import { SERVER_HELP, remoteOf, send, serverOptions } from '../remote.ts';
import { DATABASE_HELP, databaseOption, withStore } from './store-option.ts';

const help = `usage: epochwright export measurements [--target-id <id>] [--json]
       epochwright export ephemeris --target-id <id> --start <epoch> --end <epoch> [--step <duration>] [--json]
       epochwright export calendar --campaign-id <id> [--at <epoch>]
       epochwright export archive > campaign-archive.json

measurements  CSV in the layout 'epochwright import --kind measurements' reads (or JSON)
ephemeris     predictions from the target's current orbit solution, CSV (or JSON)
calendar      the campaign's planned blocks and periapsis passages as iCalendar (RFC 5545), with
              its flags as of --at (ISO 8601, JD, MJD; default now)
archive       every stored record (systems, targets, orbit solutions with covariance and provenance,
              sites, campaigns, nights, blocks, night reports, measurements, users, audit trail;
              no tokens) as JSON, for 'epochwright restore --archive' into an empty database

options:
${DATABASE_HELP}
${SERVER_HELP} (measurements, calendar and archive; the archive needs a lead's token)
`;

export const exportCommand: Command = {
  summary: 'export measurements, a stored target’s ephemeris, or a campaign calendar',
  help,
  async run(argv) {
    const { values, positionals } = parseArgs({
      args: argv,
      options: {
        ...databaseOption,
        ...serverOptions,
        'target-id': { type: 'string' },
        'campaign-id': { type: 'string' },
        start: { type: 'string' },
        end: { type: 'string' },
        step: { type: 'string' },
        at: { type: 'string' },
        json: { type: 'boolean' },
      },
      strict: true,
      allowPositionals: true,
    });
    const [what] = positionals;
    const targetId = optionalId('target-id', values['target-id']);
    const remote = remoteOf(values);
    if (remote) {
      if (what === 'measurements') {
        const q = new URLSearchParams({ format: values.json ? 'json' : 'csv' });
        if (targetId !== undefined) q.set('targetId', String(targetId));
        const res = await send(remote, 'GET', `/exports/measurements?${q}`);
        return values.json
          ? `${JSON.stringify(((await res.json()) as { measurements: unknown }).measurements, null, 2)}\n`
          : res.text();
      }
      if (what === 'calendar') {
        const campaignId = optionalId('campaign-id', values['campaign-id']);
        if (campaignId === undefined) throw new UsageError('export calendar needs --campaign-id');
        const q = values.at === undefined ? '' : `?at=${encodeURIComponent(values.at)}`;
        return (await send(remote, 'GET', `/campaigns/${campaignId}/calendar.ics${q}`)).text();
      }
      if (what === 'archive')
        return `${JSON.stringify(await (await send(remote, 'GET', '/exports/archive')).json())}\n`;
      throw new UsageError(
        `export ${what ?? ''} reads the database itself: run it where the database is (--server takes measurements, calendar and archive)`,
      );
    }
    return withStore(values.database, async (store) => {
      switch (what) {
        case 'measurements': {
          const rows = await store.exports.measurements({ targetId });
          return values.json ? `${JSON.stringify(rows, null, 2)}\n` : measurementsCsv(rows);
        }
        case 'ephemeris': {
          if (targetId === undefined || values.start === undefined || values.end === undefined)
            throw new UsageError('export ephemeris needs --target-id, --start and --end');
          const { orbit } = await store.orbitSolutions.current(targetId);
          const rows = ephemeris(
            orbit,
            resolveEpochs({ start: values.start, end: values.end, step: values.step ?? 'P30D' }),
          );
          return values.json ? `${JSON.stringify(rows, null, 2)}\n` : ephemerisCsv(rows);
        }
        case 'calendar': {
          const campaignId = optionalId('campaign-id', values['campaign-id']);
          if (campaignId === undefined) throw new UsageError('export calendar needs --campaign-id');
          return store.exports.calendar(
            campaignId,
            values.at === undefined ? {} : { flagsAtJd: parseEpoch(values.at, '--at') },
          );
        }
        case 'archive':
          return `${JSON.stringify(await store.archive())}\n`;
        default:
          throw new UsageError(
            `export: say measurements, ephemeris, calendar or archive${what ? ` (not ${JSON.stringify(what)})` : ''}`,
          );
      }
    });
  },
};
