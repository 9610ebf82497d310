/** `epochwright replan`: after a night that lost time, the rest of its campaign's season planned again. */
import type { ReplanRequest, Store } from '../../store/index.ts';
import { asOptions, checkAcceptDigest, commandArgs, positiveId, weatherOption } from '../args.ts';
import type { Command } from '../io.ts';
import { plural, render, type Column } from '../output.ts';
import { STORE_HELP, storeAction, storeOptions } from './store-option.ts';
import { momentJd } from '../../clock.ts';

const help = `usage: epochwright replan --night-id <id> [--end <date>] [--weather aware|blind] [--at <epoch>]
                        [--accept [--digest <hex>]] [--json | --csv]

After a night whose report records lost time, plans the rest of its campaign's season again: the
campaign's allocated nights from the night after it (or from the day before --at, whichever is
later) to the campaign's end, weather-aware unless --weather blind. Shows the lost blocks and the
new epochs. As with plan-season, only blocks that are still plans are replaced: obtained, logged,
measured, begun, hand-made and pinned blocks stay. Nothing is written unless --accept is given.

options:
  --night-id <id>        the night that lost time
  --end <date>           last night to plan; default the campaign's last (at most 400 nights on)
  --weather aware|blind  default aware
  --at <epoch>           the moment of planning; default now (with --accept, not in the past)
  --accept               store the re-plan (as the local operator)
  --digest <hex>         with --accept: refuse if the plan differs from the preview with this digest
${STORE_HELP}
  --json | --csv         machine-readable output instead of a table
`;

export const replanCommand: Command = {
  summary:
    'after a night that lost time, the rest of the season planned again (--accept stores it)',
  help,
  async run(argv) {
    const { values, format } = commandArgs(argv, {
      ...storeOptions,
      'night-id': { type: 'string' },
      end: { type: 'string' },
      weather: { type: 'string' },
      at: { type: 'string' },
      accept: { type: 'boolean' },
      digest: { type: 'string' },
    });
    const id = positiveId('night-id', values['night-id']);
    checkAcceptDigest(values);
    const weather = weatherOption(values.weather);
    const request: ReplanRequest = {
      weather,
      ...(values.end !== undefined ? { endDate: values.end } : {}),
      ...(values.digest !== undefined ? { digest: values.digest } : {}),
    };
    const atJd = momentJd(values.at, '--at');
    const options = { nightId: '--night-id', endDate: '--end', '*': '--weather' };
    type Preview = Awaited<ReturnType<Store['plans']['previewReplan']>>;
    const result = await asOptions(options, () =>
      storeAction<Preview & { written?: unknown[] }>(values, {
        local: (store, actor) =>
          values.accept
            ? store.plans.acceptReplan(actor, id, request, atJd)
            : store.plans.previewReplan(id, request, atJd),
        remote: {
          method: 'POST',
          path: `/nights/${id}/replan${values.accept ? '/accept' : ''}`,
          body: { ...request, at: values.at },
        },
        writes: values.accept === true,
      }),
    );
    type Epoch = (typeof result.preview.plan.epochs)[number];
    const columns: Column<Epoch>[] = [
      { header: 'night', value: (e) => e.date },
      { header: 'site', value: (e) => e.site },
      { header: 'start_utc', value: (e) => e.block.start.utc.slice(0, 16) },
      { header: 'target', value: (e) => e.target },
      { header: 'kind', value: (e) => e.kind },
      { header: 'why', value: (e) => e.why },
    ];
    if (format !== 'table') return render(format, result.preview.plan.epochs, columns, result);
    const n = result.night;
    const stored = result.written ? { written: result.written } : null;
    return [
      `night ${n.id} (${n.date}) lost ${n.timeLostHours.toFixed(1)} ` +
        `h${n.reason ? ` (${n.reason})` : ''}; lost blocks: ` +
        `${result.lost.map((b) => `${b.blockId} ${b.target} ${b.kind} (${b.status})`).join(', ') || 'none'}`,
      `re-planned ${result.request.startDate} to ${result.request.endDate}, ` +
        `weather-${result.request.weather}: ${result.preview.plan.epochs.length} epochs`,
      stored
        ? `accepted: ${plural(stored.written.length, 'block')} written, ${result.preview.replaces.length} replaced`
        : `preview only (digest ${result.preview.digest}): accepting would replace ` +
          `${result.preview.replaces.length} stored blocks; run again with --accept to store it`,
      '',
      render('table', result.preview.plan.epochs, columns, result),
    ].join('\n');
  },
};
