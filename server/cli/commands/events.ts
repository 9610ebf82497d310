/** `epochwright events`: periapsis, apoapsis, nodes and extrema in an interval. */
import { parseArgs } from 'node:util';
import {
  EVENT_KINDS,
  eventsWithUncertainty,
  type EventKind,
  type EventWithUncertainty,
} from '../../science/orbit/index.ts';
import { parseEpoch } from '../../science/time/index.ts';
import { describeOrbit } from '../../science/orbit/index.ts';
import { UsageError, type Command } from '../io.ts';
import { outputFormat } from '../args.ts';
import { render, type Column } from '../output.ts';
import {
  ORBIT_OPTION_HELP,
  epochPrinter,
  orbitOptions,
  readMonteCarlo,
  orbitOf,
} from './orbit-args.ts';

const help = `usage: epochwright events --orbit <json|file> | --target-id <id> --start <epoch> --end <epoch> [--kinds <k,k,…>] [options]

Lists, soonest first, the orbit's events between two epochs with the state at each: separation,
position angle, radial velocity. With a covariance, each date comes with its 1σ in days; with --mc,
with the 2.5/16/50/84/97.5 percentiles of the date. With the Rømer delay on, each event shows its
observed time (light-time across the orbit included) and its emitted time (when the light left the
star); without it the two are one clock and one column.

kinds: ${EVENT_KINDS.join(', ')} (default: all)

options:
  --start, --end         the interval (epochs as for 'ephemeris')
  --kinds                a comma-separated subset of the kinds above
${ORBIT_OPTION_HELP}
`;

export const eventsCommand: Command = {
  summary: 'find periapsis and apoapsis passages, nodes and extrema in an interval',
  help,
  async run(argv) {
    const { values } = parseArgs({
      args: argv,
      options: {
        ...orbitOptions,
        start: { type: 'string' },
        end: { type: 'string' },
        kinds: { type: 'string' },
      },
      strict: true,
      allowPositionals: false,
    });
    const format = outputFormat(values);
    const orbit = await orbitOf(values);
    if (values.start === undefined || values.end === undefined)
      throw new UsageError('--start and --end are required');
    const kinds = values.kinds?.split(',').map((k) => k.trim());
    for (const k of kinds ?? []) {
      if (!(EVENT_KINDS as readonly string[]).includes(k))
        throw new UsageError(
          `--kinds: ${JSON.stringify(k)} must be one of ${EVENT_KINDS.join(', ')}`,
        );
    }
    const mc = readMonteCarlo(values);
    const events = eventsWithUncertainty(
      orbit,
      parseEpoch(values.start, '--start'),
      parseEpoch(values.end, '--end'),
      {
        ...(kinds ? { kinds: kinds as EventKind[] } : {}),
        ...(mc ? { monteCarlo: mc } : {}),
      },
    );
    const show = epochPrinter(values.time);
    // With the Rømer delay on, an event has an observed time (light-time included) and an emitted
    // one; both are shown. Without it the two are one clock.
    const columns: Column<EventWithUncertainty>[] = orbit.relativity.romer
      ? [
          { header: 'event', value: (e) => e.kind },
          { header: 'observed', value: (e) => show(e.jd) },
          { header: 'emitted', value: (e) => show(e.state.emissionJd) },
        ]
      : [
          { header: 'event', value: (e) => e.kind },
          { header: 'epoch', value: (e) => show(e.jd) },
        ];
    if (orbit.covariance)
      columns.push({ header: 'sigma_days', value: (e) => e.sigmaDays, digits: 2 });
    if (mc) {
      columns.push(
        { header: 'p16', value: (e) => e.percentileEpochs?.[1]?.slice(0, 16) },
        { header: 'p84', value: (e) => e.percentileEpochs?.[3]?.slice(0, 16) },
      );
    }
    columns.push(
      { header: 'rho_mas', value: (e) => e.state.separationMas, digits: 3 },
      { header: 'theta_deg', value: (e) => e.state.positionAngleDeg, digits: 3 },
    );
    if (orbit.distancePc !== null) {
      columns.push(
        { header: 'rv_kms', value: (e) => e.state.radialVelocityKmS, digits: 2 },
        { header: 'r3d_au', value: (e) => e.state.separation3dAu, digits: 2 },
      );
    }
    return render(format, events, columns, { orbit: describeOrbit(orbit), events });
  },
};
