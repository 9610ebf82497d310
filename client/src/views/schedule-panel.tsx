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
const NO_EDITS: Edits = { pins: {}, remove: [] };

const editsBody = (e: Edits) => ({
  pins: Object.entries(e.pins).map(([id, start]) => ({ id, start })),
  remove: e.remove,
});

// Each change to a proposal is a new set of edits; the server re-schedules the rest around them.
const withPin = (e: Edits, b: ScheduledBlock, shiftMin: number): Edits => ({
  ...e,
  pins: { ...e.pins, [b.id]: isoOf(ms(b.start.utc) + shiftMin * 60_000) },
});
const withoutPin = (e: Edits, id: string): Edits => {
  const { [id]: _, ...pins } = e.pins;
  return { ...e, pins };
};
const withLeftOut = (e: Edits, id: string): Edits => ({
  pins: withoutPin(e, id).pins,
  remove: [...e.remove, id],
});
const withPutBack = (e: Edits, id: string): Edits => ({
  ...e,
  remove: e.remove.filter((r) => r !== id),
});

function storedWords(written: number, replaced: number): string {
  return `Stored: ${plural(written, 'block')} written, ${plural(replaced, 'planned block')} replaced.`;
}

/** A 409 means the schedule changed since the proposal (its digest no longer matches). */
const staleSchedule = (err: unknown) =>
  err instanceof ApiError && err.status === 409
    ? new Error(`${err.message}. Propose again to see the schedule as it now comes out.`)
    : err;

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
  const propose = (e: Edits) =>
    run(async () => {
      setEdits(e);
      const p = await api.POST('/nights/{id}/schedule', {
        params: { path: { id: night.id } },
        body: editsBody(e),
      });
      setPreview(p);
      onProposal?.(p.schedule.blocks);
    });
  const discard = () => {
    setPreview(null);
    onProposal?.(null);
    setEdits(NO_EDITS);
  };
  const accept = async () => {
    if (!preview) return;
    await run(async () => {
      const r = await api.POST('/nights/{id}/schedule/accept', {
        params: { path: { id: night.id } },
        body: { ...editsBody(edits), digest: preview.digest },
      });
      setStored(storedWords(r.written.length, preview.replaces.length));
      discard();
      onChanged();
    }, staleSchedule);
  };
  return (
    <Section title="Scheduler" id="scheduler">
      <p class="muted">
        Proposes the night from the campaign’s targets and goals: blocks inside darkness and each
        target’s window, best airmass first. Pin a block to keep it where it is, move it, or leave
        it out; the rest is re-scheduled around it. Nothing is stored until you store it.
      </p>
      <ScheduleToolbar
        busy={busy}
        reviewing={preview !== null}
        canEdit={canEdit}
        stored={stored}
        onPropose={() => propose(edits)}
        onAccept={accept}
        onDiscard={discard}
      />
      <ErrorLine error={error} />
      {preview && (
        <ScheduleProposal
          preview={preview}
          zone={cat.site(night.siteId)?.timeZone ?? 'UTC'}
          edits={edits}
          onEdits={propose}
        />
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

function ScheduleToolbar(p: {
  busy: boolean;
  reviewing: boolean;
  canEdit: boolean;
  stored: string;
  onPropose: () => void;
  onAccept: () => void;
  onDiscard: () => void;
}) {
  const { busy } = p;
  return (
    <div class="toolbar">
      <button type="button" class="primary" disabled={busy} onClick={p.onPropose}>
        {p.reviewing ? 'Re-schedule' : 'Propose a schedule'}
      </button>
      {p.reviewing && p.canEdit && (
        <button type="button" disabled={busy} onClick={p.onAccept}>
          Store this schedule
        </button>
      )}
      {p.reviewing && (
        <button type="button" disabled={busy} onClick={p.onDiscard}>
          Discard proposal
        </button>
      )}
      {busy && <span class="loading">working…</span>}
      {p.stored && (
        <span class="save-status" role="status">
          {p.stored}
        </span>
      )}
    </div>
  );
}

type ProposalProps = {
  preview: SchedulePreview;
  zone: string;
  edits: Edits;
  onEdits: (e: Edits) => void;
};

/** A proposal: its cautions and size, what storing replaces and keeps, its blocks, what is left out. */
function ScheduleProposal({ preview, zone, edits, onEdits }: ProposalProps) {
  const s = preview.schedule;
  return (
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
            <ProposedRow key={b.id} b={b} zone={zone} edits={edits} onEdits={onEdits} />
          ))}
        </tbody>
      </table>
      <h3>Left out, and why</h3>
      <LeftOut preview={preview} edits={edits} onEdits={onEdits} />
    </>
  );
}

/** A proposed block with its times and heights, and the pin, move and leave-out actions. */
function ProposedRow({
  b,
  zone,
  edits,
  onEdits,
}: Omit<ProposalProps, 'preview'> & { b: ScheduledBlock }) {
  return (
    <tr data-proposed={b.id}>
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
      <BlockActions b={b} edits={edits} onEdits={onEdits} />
    </tr>
  );
}

/** Pin or unpin a block, move it a step earlier or later (pinning it there), or leave it out. */
function BlockActions({
  b,
  edits,
  onEdits,
}: Omit<ProposalProps, 'preview' | 'zone'> & { b: ScheduledBlock }) {
  const pin = (shiftMin: number) => onEdits(withPin(edits, b, shiftMin));
  return (
    <td class="actions">
      {b.pinned ? (
        <button
          type="button"
          onClick={() => onEdits(withoutPin(edits, b.id))}
          aria-label={`unpin ${b.id}`}
        >
          Unpin
        </button>
      ) : (
        <button type="button" onClick={() => pin(0)} aria-label={`pin ${b.id}`}>
          Pin
        </button>
      )}
      <button
        type="button"
        onClick={() => pin(-MOVE_MIN)}
        aria-label={`move ${b.id} ${MOVE_MIN} minutes earlier and pin it`}
      >
        −{MOVE_MIN} min
      </button>
      <button
        type="button"
        onClick={() => pin(MOVE_MIN)}
        aria-label={`move ${b.id} ${MOVE_MIN} minutes later and pin it`}
      >
        +{MOVE_MIN} min
      </button>
      <button
        type="button"
        class="danger"
        onClick={() => onEdits(withLeftOut(edits, b.id))}
        aria-label={`leave out ${b.id}`}
      >
        Leave out
      </button>
    </td>
  );
}

/** Blocks the schedule leaves out, each with why; one the user left out can be put back. */
function LeftOut({ preview, edits, onEdits }: Omit<ProposalProps, 'zone'>) {
  const { leftOut } = preview.schedule;
  if (leftOut.length === 0) return <p class="muted">Every candidate fits.</p>;
  return (
    <ul class="left-out">
      {leftOut.map((l) => (
        <li key={l.id} data-left-out={l.id}>
          <strong>
            {l.target} {l.kind}
          </strong>
          : {l.reason}
          {edits.remove.includes(l.id) && (
            <>
              {' '}
              <button type="button" onClick={() => onEdits(withPutBack(edits, l.id))}>
                Put back
              </button>
            </>
          )}
        </li>
      ))}
    </ul>
  );
}
