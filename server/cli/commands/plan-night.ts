/** `epochwright plan-night`: the schedule of a stored night; `--accept` stores it as blocks. */
import type { ScheduledBlock } from '../../science/plan/index.ts';
import {
  ACCEPT_AT_TOLERANCE_MINUTES,
  type NightScheduleRequest,
  type Store,
} from '../../store/index.ts';
import { UsageError, type Command } from '../io.ts';
import { asOptions, checkAcceptDigest, commandArgs, positiveId, readJsonArg } from '../args.ts';
import { formatTable, plural, render, type Column } from '../output.ts';
import { STORE_HELP, storeAction, storeOptions } from './store-option.ts';
import { momentJd } from '../../clock.ts';

const help = `usage: epochwright plan-night --night-id <id> [options]

Blocks for one stored night of a campaign, in darkness, inside each target's window, with a gap for
each change of target: the campaign's candidates (one per target and goal kind, "<target>:<kind>",
astrometry 40 min, spectroscopy 60 min, doubled priority near periapsis) or your own. Every block
left out is listed with its reason; blocks using a laser guide star carry the caution.

Nothing is written unless --accept is given. Accepting replaces the night's blocks that are still
only plans and keeps obtained, logged, measured, begun, hand-made and pinned ones: the schedule is
planned around them, and a candidate of the same target and kind as a kept block is left out.
Blocks pinned with --pin are stored as pinned, so later re-plans keep them.

options:
  --night-id <id>              the stored night (its campaign gives targets and limits)
  --pin <id>@<start>           keep or move a block to a start (ISO 8601 UTC; snapped to a slot edge)
  --remove <id>                leave a candidate out (repeatable)
  --candidates <json|file>     your own candidates: [{ id, target, kind, durationMinutes, priority,
                               highestAirmass?, laserGuideStar? }]
  --method <auto|exact|heuristic>
  --slot <minutes>             slot length, [1, 30]; default 5
  --at <epoch>                 the moment of scheduling (ISO 8601, JD, MJD); default now. With
                               --accept it may not lie more than ${ACCEPT_AT_TOLERANCE_MINUTES} min before the clock
  --accept                     store the schedule (as the local operator)
  --digest <hex>               with --accept: refuse if the schedule differs from that preview
${STORE_HELP}
  --json | --csv               machine-readable output instead of a table
`;

const OPTIONS = {
  pins: '--pin',
  remove: '--remove',
  candidates: '--candidates',
  slotMinutes: '--slot',
  method: '--method',
  nightId: '--night-id',
  at: '--at',
};

export const planNightCommand: Command = {
  summary: 'schedule of a stored night: blocks, left-out blocks and why (--accept stores it)',
  help,
  async run(argv) {
    const { values, format } = commandArgs(argv, {
      ...storeOptions,
      'night-id': { type: 'string' },
      pin: { type: 'string', multiple: true },
      remove: { type: 'string', multiple: true },
      candidates: { type: 'string' },
      method: { type: 'string' },
      slot: { type: 'string' },
      at: { type: 'string' },
      accept: { type: 'boolean' },
      digest: { type: 'string' },
    });
    const id = positiveId('night-id', values['night-id']);
    checkAcceptDigest(values);
    const pins = values.pin?.map((p) => {
      const at = p.lastIndexOf('@');
      if (at <= 0)
        throw new UsageError(
          `--pin: ${JSON.stringify(p)} must be <block id>@<start>, e.g. "Ilex:astrometry@2027-06-06T05:00Z"`,
        );
      return { id: p.slice(0, at), start: p.slice(at + 1) };
    });
    const slot = values.slot === undefined ? undefined : Number(values.slot);
    if (values.slot !== undefined && !Number.isFinite(slot))
      throw new UsageError(`--slot: ${JSON.stringify(values.slot)} must be a number of minutes`);
    const request: NightScheduleRequest = {
      ...(values.candidates !== undefined
        ? { candidates: readJsonArg('candidates', values.candidates) }
        : {}),
      ...(pins ? { pins } : {}),
      ...(values.remove ? { remove: values.remove } : {}),
      ...(values.method !== undefined
        ? { method: values.method as NightScheduleRequest['method'] }
        : {}),
      ...(slot !== undefined ? { slotMinutes: slot } : {}),
      ...(values.digest !== undefined ? { digest: values.digest } : {}),
    };
    const atJd = momentJd(values.at, '--at');
    type Accepted = Awaited<ReturnType<Store['plans']['acceptNight']>>;
    const result: Awaited<ReturnType<Store['plans']['previewNight']>> & Partial<Accepted> =
      await asOptions(OPTIONS, () =>
        storeAction(values, {
          local: (store, actor) =>
            values.accept
              ? store.plans.acceptNight(actor, id, request, atJd)
              : store.plans.previewNight(id, request, atJd),
          remote: {
            method: 'POST',
            path: `/nights/${id}/schedule${values.accept ? '/accept' : ''}`,
            body: { ...request, at: values.at },
          },
          writes: values.accept === true,
        }),
      );
    const s = result.schedule;
    const local = (i: { local: string; utc: string }) =>
      format === 'table' ? i.local.slice(11, 16) : i.utc;
    const columns: Column<ScheduledBlock>[] = [
      { header: format === 'table' ? 'start' : 'start_utc', value: (b) => local(b.start) },
      { header: format === 'table' ? 'end' : 'end_utc', value: (b) => local(b.end) },
      { header: 'block', value: (b) => b.id },
      { header: 'target', value: (b) => b.target },
      { header: 'kind', value: (b) => b.kind },
      {
        header: 'airmass',
        value: (b) =>
          `${b.airmassStart.toFixed(2)}/${b.airmassMiddle.toFixed(2)}/${b.airmassEnd.toFixed(2)}`,
      },
      { header: 'pinned', value: (b) => (b.pinned ? 'yes' : '') },
      { header: 'laser', value: (b) => (b.laserGuideStar ? 'yes' : '') },
    ];
    if (format !== 'table') return render(format, s.blocks, columns, result);
    const written = result.written
      ? `accepted: ${plural(result.written.length, 'block')} written, ${result.replaces.length} replaced\n`
      : `preview only (digest ${result.digest}): accepting would replace stored blocks ` +
        `[${result.replaces.join(', ')}]; run again with --accept to store it\n`;
    return [
      `${s.site}, night of ${s.date} (${s.timeZone}; local times), ${s.method} schedule: ` +
        `${s.scheduledHours.toFixed(2)} h of ${s.darkHours.toFixed(2)} h dark\n\n`,
      formatTable(s.blocks, columns),
      s.leftOut.length
        ? `\nleft out:\n${s.leftOut.map((l) => `  ${l.id}: ${l.reason}\n`).join('')}`
        : '',
      result.kept.length
        ? `\nstored blocks kept:\n${result.kept.map((k) => `  block ${k.id}: ${k.reason}\n`).join('')}`
        : '',
      '\n',
      written,
      ...s.cautions.map((c) => `note: ${c}\n`),
    ].join('');
  },
};
