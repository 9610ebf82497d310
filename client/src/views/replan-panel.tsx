/**
 * After a night that lost time: plan the rest of the campaign's season again in one action,
 * preview first (the lost blocks, the new epochs, what accepting replaces), then accept as a lead.
 * Server: POST /nights/{id}/replan and /replan/accept (only blocks still planned are replaced).
 */
import { useState } from 'preact/hooks';
import { ApiError, api, getAll, type Schemas } from '../api/client.ts';
import { ErrorLine, useCan } from '../lib/ui.tsx';
import { plural } from '../lib/words.ts';
import { useAction } from '../lib/use-action.ts';
import { useLoad } from '../lib/use-load.ts';

type Replan = Schemas['Replan'];

function storedWords(r: { written: unknown[]; preview: { replaces: unknown[] } }): string {
  const written = plural(r.written.length, 'block');
  const replaced = plural(r.preview.replaces.length, 'planned block');
  return `Re-plan stored: ${written} written, ${replaced} replaced; obtained and logged blocks kept.`;
}

/** A 409 means the plan changed since the preview (its digest no longer matches). */
const stalePreview = (e: unknown) =>
  e instanceof ApiError && e.status === 409
    ? new Error(`${e.message}. Preview again to see the plan as it now comes out.`)
    : e;

export function ReplanPanel({ nightId, tick }: { nightId: number; tick: number }) {
  const { data: reports } = useLoad(() => getAll('/night-reports', { nightId }), [nightId, tick]);
  const [preview, setPreview] = useState<Replan | null>(null);
  const [status, setStatus] = useState('');
  const { busy, error, run } = useAction();
  const report = reports?.[0];
  if (!report || !(report.timeLostHours > 0))
    return (
      <p class="muted replan-none">
        {report
          ? 'This night lost no time: nothing to re-plan.'
          : 'Once the report records lost time, the rest of the season can be planned again here.'}
      </p>
    );
  const propose = () =>
    run(async () => {
      setStatus('');
      setPreview(
        await api.POST('/nights/{id}/replan', { params: { path: { id: nightId } }, body: {} }),
      );
    });
  const accept = () =>
    run(async () => {
      const r = await api.POST('/nights/{id}/replan/accept', {
        params: { path: { id: nightId } },
        body: { digest: preview!.preview.digest },
      });
      setStatus(storedWords(r));
      setPreview(null);
    }, stalePreview);
  return (
    <div class="replan">
      <p>
        This night lost {report.timeLostHours.toFixed(1)} h
        {report.timeLostReason ? ` (${report.timeLostReason})` : ''}.{' '}
        <button type="button" disabled={busy} onClick={propose}>
          Re-plan the rest of the season
        </button>
      </p>
      {status && (
        <p class="notice" role="status">
          {status}
        </p>
      )}
      <ErrorLine error={error} />
      {preview && <ReplanPreview preview={preview} busy={busy} onAccept={accept} />}
    </div>
  );
}

/** What the re-plan would do: the lost blocks, the new plan's range and size, each periapsis. */
function ReplanPreview({
  preview,
  busy,
  onAccept,
}: {
  preview: Replan;
  busy: boolean;
  onAccept: () => void;
}) {
  const lead = useCan('lead');
  return (
    <div class="replan-preview">
      <p>
        Lost here:{' '}
        {preview.lost.map((b) => `${b.target} ${b.kind} (${b.status})`).join(', ') ||
          'no block was marked lost'}
        . New plan from {preview.request.startDate} to {preview.request.endDate} (
        {preview.request.weather === 'aware'
          ? 'nights weighed by their chance of being clear'
          : 'every night counted as clear'}
        ): {plural(preview.preview.plan.epochs.length, 'epoch')}; accepting replaces{' '}
        {plural(preview.preview.replaces.length, 'block')} that are still only plans.
      </p>
      <ul class="replan-targets">
        {preview.preview.plan.targets
          .filter((t) => t.passage)
          .map((t) => (
            <li key={t.target}>
              {t.target}: periapsis {t.passage!.date.slice(0, 10)}, coverage within{' '}
              {t.passage!.coverage.withinDays} d {(100 * t.passage!.coverage.after).toFixed(0)} %
              with {t.passage!.epochs} epochs in its window
            </li>
          ))}
      </ul>
      {lead ? (
        <button type="button" class="primary" disabled={busy} onClick={onAccept}>
          Accept the re-plan
        </button>
      ) : (
        <p class="muted">Accepting needs the lead role.</p>
      )}
    </div>
  );
}
