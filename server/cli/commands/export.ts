/** `epochwright export`: measurements (CSV in the import layout, or JSON), or a stored target's ephemeris. */
import { parseArgs } from 'node:util';
import { ephemeris } from '../../science/orbit/index.ts';
import { parseEpoch } from '../../science/time/index.ts';
import { resolveEpochs } from '../../science/time/index.ts';
import { ephemerisCsv, measurementsCsv, orbitsCsv } from '../../store/index.ts';
import { optionalId } from '../args.ts';
import { UsageError, type Command } from '../io.ts';
import { STORE_HELP, storeAction, storeOptions } from './store-option.ts';

const help = `usage: epochwright export measurements [--target-id <id>] [--json]
       epochwright export orbits [--target-id <id> | --system-id <id>] [--current] > orbits.csv
       epochwright export ephemeris --target-id <id> --start <epoch> --end <epoch> [--step <duration>] [--json]
       epochwright export calendar --campaign-id <id> [--at <epoch>]
       epochwright export archive > campaign-archive.json

measurements  CSV in the layout 'epochwright import --kind measurements' reads (or JSON)
orbits        orbit solutions (every version, or --current only) with σ and correlations, CSV in
              the layout 'epochwright import --kind orbits' reads back
ephemeris     predictions from the target's current orbit solution, CSV (or JSON)
calendar      the campaign's planned blocks and periapsis passages as iCalendar (RFC 5545), with
              its flags as of --at (ISO 8601, JD, MJD; default now)
archive       every stored record (systems, targets, orbit solutions with covariance and provenance,
              sites, campaigns, nights, blocks, night reports, measurements, users, audit trail;
              no tokens) as JSON, for 'epochwright restore --archive' into an empty database

options:
  --target-id <id>       measurements, orbits: only this target's; ephemeris: the target
  --system-id <id>       orbits: only this system's targets'
  --current              orbits: only each target's current solution
  --start, --end <epoch> ephemeris: first and last epoch (ISO 8601, JD, MJD, J…)
  --step <duration>      ephemeris: ISO 8601 duration between epochs (default P30D)
  --campaign-id <id>     calendar: the campaign
  --at <epoch>           calendar: the moment its flags are computed for
  --json                 measurements and ephemeris as JSON
${STORE_HELP} (the archive needs a lead's token)
`;

export const exportCommand: Command = {
  summary: 'export measurements, orbit solutions, an ephemeris, a campaign calendar, or everything',
  help,
  async run(argv) {
    const { values, positionals } = parseArgs({
      args: argv,
      options: {
        ...storeOptions,
        'target-id': { type: 'string' },
        'campaign-id': { type: 'string' },
        'system-id': { type: 'string' },
        current: { type: 'boolean' },
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
    const json = (x: unknown) => `${JSON.stringify(x, null, 2)}\n`;
    switch (what) {
      case 'measurements':
        return storeAction(values, {
          local: async (store) => {
            const rows = await store.exports.measurements({ targetId });
            return values.json ? json(rows) : measurementsCsv(rows);
          },
          remote: async (api) => {
            const request = {
              method: 'GET',
              path: '/exports/measurements',
              query: { format: values.json ? 'json' : 'csv', targetId },
            } as const;
            return values.json
              ? json((await api<{ measurements: unknown }>(request)).measurements)
              : api<string>(request);
          },
        });
      case 'orbits': {
        const systemId = optionalId('system-id', values['system-id']);
        const filter = {
          ...(targetId === undefined ? {} : { targetId }),
          ...(systemId === undefined ? {} : { systemId }),
        };
        return storeAction(values, {
          local: async (store) =>
            orbitsCsv(
              await store.exports.orbits({ ...filter, currentOnly: values.current === true }),
            ),
          remote: {
            method: 'GET',
            path: '/exports/orbits',
            query: { ...filter, current: values.current === true },
          },
        });
      }
      case 'ephemeris': {
        if (targetId === undefined || values.start === undefined || values.end === undefined)
          throw new UsageError('export ephemeris needs --target-id, --start and --end');
        const range = { start: values.start, end: values.end, step: values.step ?? 'P30D' };
        return storeAction(values, {
          local: async (store) => {
            const { orbit } = await store.orbitSolutions.current(targetId);
            const rows = ephemeris(orbit, resolveEpochs(range));
            return values.json ? json(rows) : ephemerisCsv(rows);
          },
          remote: async (api) => {
            const request = {
              method: 'GET',
              path: `/targets/${targetId}/ephemeris`,
              query: { ...range, format: values.json ? 'json' : 'csv' },
            } as const;
            return values.json
              ? json((await api<{ predictions: unknown }>(request)).predictions)
              : api<string>(request);
          },
        });
      }
      case 'calendar': {
        const campaignId = optionalId('campaign-id', values['campaign-id']);
        if (campaignId === undefined) throw new UsageError('export calendar needs --campaign-id');
        return storeAction(values, {
          local: (store) =>
            store.exports.calendar(
              campaignId,
              values.at === undefined ? {} : { flagsAtJd: parseEpoch(values.at, '--at') },
            ),
          remote: {
            method: 'GET',
            path: `/campaigns/${campaignId}/calendar.ics`,
            query: { at: values.at },
          },
        });
      }
      case 'archive':
        return `${JSON.stringify(
          await storeAction(values, {
            local: (store) => store.archive(),
            remote: { method: 'GET', path: '/exports/archive' },
          }),
        )}\n`;
      default:
        throw new UsageError(
          `export: say measurements, orbits, ephemeris, calendar or archive${what ? ` (not ${JSON.stringify(what)})` : ''}`,
        );
    }
  },
};
