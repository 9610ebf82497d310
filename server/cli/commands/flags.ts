/** `epochwright flags`: a stored campaign's planning flags, soonest first. */
import type { Flag } from '../../science/plan/index.ts';
import type { Command } from '../io.ts';
import { commandArgs, optionalPositive, positiveId } from '../args.ts';
import { render, type Column } from '../output.ts';
import type { Store } from '../../store/index.ts';
import { STORE_HELP, storeAction, storeOptions } from './store-option.ts';
import { momentJd } from '../../clock.ts';

const help = `usage: epochwright flags --campaign-id <id> [--at <epoch>] [--resolution <mas>] [--json | --csv]

Warnings for every target of a stored campaign, soonest first: a periapsis ahead (date ± 1σ, lead
time, observable hours per night at each site, rates of change, relativistic terms), a periapsis no
site can observe, a blend with another star of the system (with --resolution), a stale prediction
(judged when a site can next observe the target). Dates are UTC; nights in the words are named by
their site and local evening date.

options:
  --campaign-id <id>     the campaign
  --at <epoch>           compute for this moment (ISO 8601, JD, MJD); default now
  --resolution <mas>     resolution limit for blend flags
${STORE_HELP}
  --json | --csv         machine-readable output instead of a table
`;

export const flagsCommand: Command = {
  summary: 'periapsis, blend and stale-prediction flags of a stored campaign',
  help,
  async run(argv) {
    const { values, format } = commandArgs(argv, {
      ...storeOptions,
      'campaign-id': { type: 'string' },
      at: { type: 'string' },
      resolution: { type: 'string' },
    });
    const id = positiveId('campaign-id', values['campaign-id']);
    const nowJd = momentJd(values.at, '--at');
    const resolution = optionalPositive('resolution', values.resolution);
    type Flags = Awaited<ReturnType<Store['plans']['flags']>>;
    const result = await storeAction<Flags>(values, {
      local: (store) =>
        store.plans.flags(id, { nowJd, ...(resolution ? { resolutionMas: resolution } : {}) }),
      // The server's flags for the same moment (the epoch as typed, read by its parser).
      remote: {
        method: 'GET',
        path: `/campaigns/${id}/flags`,
        query: { at: values.at, resolutionMas: resolution },
      },
    });
    const columns: Column<Flag>[] = [
      { header: 'date_utc', value: (f) => f.date.slice(0, 16).replace('T', ' ') },
      { header: 'days_ahead', value: (f) => f.daysAhead, digits: 0 },
      { header: 'kind', value: (f) => f.kind },
      { header: 'target', value: (f) => f.target },
      { header: 'reason', value: (f) => f.reason },
    ];
    return render(format, result.flags, columns, result);
  },
};
