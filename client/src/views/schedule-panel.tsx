/**
 * The night's scheduler: propose a schedule from the campaign's candidates, pin or move a proposed
 * block, leave one out, and every change re-schedules the rest; each block left out says why.
 * Storing it replaces the night's blocks that are still only plans (the server says which it keeps).
 */
import { useState } from 'preact/hooks';
import { ApiError, api, type Schemas } from '../api/client.ts';
import type { Catalogue } from '../api/catalogue.ts';
import type { BlockRow, NightRow } from '../api/client.ts';
import { isoOf, ms, utcClock, zoneClock } from '../lib/time.ts';
import { Caution, ErrorLine, Qty, Section } from '../lib/ui.tsx';
import { useAction } from '../lib/use-action.ts';
import { plural } from '../lib/words.ts';

export type ScheduledBlock = Schemas['ScheduledBlock'];
export type SchedulePreview = Schemas['NightSchedulePreview'];
interface Edits {
  pins: Record<string, string>;
  remove: string[];
}

const MOVE_MIN = 15;

export function SchedulePanel({
  night,
  blocks,
  cat,
  canEdit,
  onChanged,
  onProposal,
}: {
  night: NightRow;
  blocks: BlockRow[];
  cat: Catalogue;
  canEdit: boolean;
  onChanged: () => void;
  onProposal?: (p: ScheduledBlock[] | null) => void;
}) {
  const [edits, setEdits] = useState<Edits>({ pins: {}, remove: [] });
  const [preview, setPreview] = useState<SchedulePreview | null>(null);
  const { busy, error, run } = useAction();
  const [stored, setStored] = useState<string>('');
  const zone = cat.site(night.siteId)?.timeZone ?? 'UTC';
  const body = (e: Edits) => ({
    pins: Object.entries(e.pins).map(([id, start]) => ({ id, start })),
    remove: e.remove,
  });
  const propose = (e: Edits) =>
    run(async () => {
      setEdits(e);
      const p = await api.POST('/nights/{id}/schedule', {
        params: { path: { id: night.id } },
        body: body(e),
      });
      setPreview(p);
      onProposal?.(p.schedule.blocks);
    });
  const accept = async () => {
    if (!preview) return;
    await run(
      async () => {
        const r = await api.POST('/nights/{id}/schedule/accept', {
          params: { path: { id: night.id } },
          body: { ...body(edits), digest: preview.digest },
        });
        setStored(
          `Stored: ${plural(r.written.length, 'block')} written, ${plural(preview.replaces.length, 'planned block')} replaced.`,
        );
        setPreview(null);
        onProposal?.(null);
        setEdits({ pins: {}, remove: [] });
        onChanged();
      },
      (err) =>
        err instanceof ApiError && err.status === 409
          ? new Error(`${err.message}. Propose again to see the schedule as it now comes out.`)
          : err,
    );
  };
  const pin = (b: ScheduledBlock, shiftMin = 0) =>
    propose({
      ...edits,
      pins: { ...edits.pins, [b.id]: isoOf(ms(b.start.utc) + shiftMin * 60_000) },
    });
  const unpin = (b: ScheduledBlock) => {
    const { [b.id]: _, ...rest } = edits.pins;
    return propose({ ...edits, pins: rest });
  };
  const leaveOut = (id: string) => {
    const { [id]: _, ...pins } = edits.pins;
    return propose({ pins, remove: [...edits.remove, id] });
  };
  const s = preview?.schedule;
  return (
    <Section title="Scheduler" id="scheduler">
      <p class="muted">
        Proposes the night from the campaign’s targets and goals: blocks inside darkness and each
        target’s window, best airmass first. Pin a block to keep it where it is, move it, or leave
        it out; the rest is re-scheduled around it. Nothing is stored until you store it.
      </p>
      <div class="toolbar">
        <button type="button" class="primary" disabled={busy} onClick={() => propose(edits)}>
          {preview ? 'Re-schedule' : 'Propose a schedule'}
        </button>
        {preview && canEdit && (
          <button type="button" disabled={busy} onClick={accept}>
            Store this schedule
          </button>
        )}
        {preview && (
          <button
            type="button"
            disabled={busy}
            onClick={() => {
              setPreview(null);
              onProposal?.(null);
              setEdits({ pins: {}, remove: [] });
            }}
          >
            Discard proposal
          </button>
        )}
        {busy && <span class="loading">working…</span>}
        {stored && (
          <span class="save-status" role="status">
            {stored}
          </span>
        )}
      </div>
      <ErrorLine error={error} />
      {s && preview && (
        <>
          {s.cautions.map((c) => (
            <Caution key={c}>{c}</Caution>
          ))}
          <p>
            {plural(s.blocks.length, 'block')}, <Qty v={s.scheduledHours} unit="h" /> of{' '}
            <Qty v={s.darkHours} unit="h" /> darkness ({s.method} solution). Storing replaces{' '}
            {plural(preview.replaces.length, 'planned block')}
            {preview.kept.length
              ? `; keeps ${preview.kept.length}: ${preview.kept.map((k) => `#${k.id} (${k.reason})`).join(', ')}`
              : ''}
            .
          </p>
          <table class="data proposal">
            <thead>
              <tr>
                <th>block</th>
                <th>UTC</th>
                <th>local</th>
                <th>airmass (middle)</th>
                <th>altitude (°, middle)</th>
                <th>pinned</th>
                <th>change</th>
              </tr>
            </thead>
            <tbody>
              {s.blocks.map((b) => (
                <tr key={b.id} data-proposed={b.id}>
                  <td>
                    {b.target} {b.kind}
                    {b.laserGuideStar && <span class="tag lgs-tag">laser guide star</span>}
                  </td>
                  <td>
                    {utcClock(b.start.utc)}–{utcClock(b.end.utc)}
                  </td>
                  <td>
                    {zoneClock(b.start.utc, zone)}–{zoneClock(b.end.utc, zone)}
                  </td>
                  <td>
                    <Qty v={b.airmassMiddle} unit="" digits={2} />
                  </td>
                  <td>
                    <Qty v={b.altitudeMiddleDeg} unit="" digits={0} />
                  </td>
                  <td>{b.pinned ? 'pinned' : ''}</td>
                  <td class="actions">
                    {b.pinned ? (
                      <button type="button" onClick={() => unpin(b)} aria-label={`unpin ${b.id}`}>
                        Unpin
                      </button>
                    ) : (
                      <button type="button" onClick={() => pin(b)} aria-label={`pin ${b.id}`}>
                        Pin
                      </button>
                    )}
                    <button
                      type="button"
                      onClick={() => pin(b, -MOVE_MIN)}
                      aria-label={`move ${b.id} ${MOVE_MIN} minutes earlier and pin it`}
                    >
                      −{MOVE_MIN} min
                    </button>
                    <button
                      type="button"
                      onClick={() => pin(b, MOVE_MIN)}
                      aria-label={`move ${b.id} ${MOVE_MIN} minutes later and pin it`}
                    >
                      +{MOVE_MIN} min
                    </button>
                    <button
                      type="button"
                      class="danger"
                      onClick={() => leaveOut(b.id)}
                      aria-label={`leave out ${b.id}`}
                    >
                      Leave out
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <h3>Left out, and why</h3>
          {s.leftOut.length === 0 ? (
            <p class="muted">Every candidate fits.</p>
          ) : (
            <ul class="left-out">
              {s.leftOut.map((l) => (
                <li key={l.id} data-left-out={l.id}>
                  <strong>
                    {l.target} {l.kind}
                  </strong>
                  : {l.reason}
                  {edits.remove.includes(l.id) && (
                    <>
                      {' '}
                      <button
                        type="button"
                        onClick={() =>
                          propose({ ...edits, remove: edits.remove.filter((r) => r !== l.id) })
                        }
                      >
                        Put back
                      </button>
                    </>
                  )}
                </li>
              ))}
            </ul>
          )}
        </>
      )}
      {blocks.length > 0 && !preview && (
        <p class="muted">
          The night already has {plural(blocks.length, 'stored block')}; a stored schedule replaces
          those still only planned.
        </p>
      )}
    </Section>
  );
}
