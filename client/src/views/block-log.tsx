/**
 * Blocks written by a person: one that ran on a night that has ended (obtained, partial or lost,
 * with its real start and end), or one planned by hand on a night ahead; and the edit of a stored
 * block's times and status. Times are typed on the site's clock or in UTC, as the log was kept.
 */
import { useState } from 'preact/hooks';
import { BLOCK_KINDS } from '../../../descriptors/measurement-kinds.ts';
import { api, fieldMessages } from '../api/client.ts';
import type { Catalogue } from '../api/catalogue.ts';
import type { BlockRow, NightRow, Visibility } from '../api/client.ts';
import { clockInNight, clockOf, ms } from '../lib/time.ts';
import { ErrorLine } from '../lib/ui.tsx';
import { useAction } from '../lib/use-action.ts';

type Status = BlockRow['status'];
type Kind = BlockRow['kind'];
/** What a person may say of a block on a night that has ended, and on one still ahead. */
const RAN: Status[] = ['obtained', 'partial', 'lost', 'withdrawn'];
const AHEAD: Status[] = ['planned', 'withdrawn'];
export const statusesFor = (ended: boolean): Status[] => (ended ? RAN : AHEAD);

/** The night has ended once its last darkness is over (or its span, on a night with none). */
export function nightEnded(vis: Visibility, nowMs: number): boolean {
  const dark = vis.darkness.intervals;
  const end = dark.length ? dark[dark.length - 1]!.end.utc : vis.night.end.utc;
  return nowMs >= ms(end);
}

type Clock = 'site' | 'utc';

/** Both ends of a block from the typed clock times, or the field and rule that fail. */
function instants(
  vis: Visibility,
  clock: Clock,
  start: string,
  end: string,
): { startUtc: string; endUtc: string } | { field: string; rule: string } {
  const zone = clock === 'utc' ? 'UTC' : vis.site.timeZone;
  const span = [ms(vis.night.start.utc), ms(vis.night.end.utc)] as const;
  const s = clockInNight(start, zone, ...span);
  if ('rule' in s) return { field: 'startUtc', rule: s.rule };
  const e = clockInNight(end, zone, ...span);
  if ('rule' in e) return { field: 'endUtc', rule: e.rule };
  return { startUtc: s.iso, endUtc: e.iso };
}

function ClockChoice({
  clock,
  onClock,
  zone,
}: {
  clock: Clock;
  onClock: (c: Clock) => void;
  zone: string;
}) {
  return (
    <label class="field">
      <span>times on</span>
      <select name="clock" value={clock} onChange={(e) => onClock(e.currentTarget.value as Clock)}>
        <option value="site">the site’s clock ({zone})</option>
        <option value="utc">UTC</option>
      </select>
    </label>
  );
}

function TimeField(p: {
  name: string;
  label: string;
  value: string;
  msg: string | undefined;
  onInput: (v: string) => void;
}) {
  return (
    <label class={p.msg ? 'field invalid' : 'field'}>
      <span>{p.label}</span>
      <input
        name={p.name}
        type="text"
        inputMode="numeric"
        placeholder="22:40"
        value={p.value}
        aria-invalid={!!p.msg}
        onInput={(e) => p.onInput(e.currentTarget.value)}
      />
      {p.msg && <span class="field-msg">{p.msg}</span>}
    </label>
  );
}

function StatusField(p: {
  ended: boolean;
  statuses: Status[];
  value: Status;
  msg: string | undefined;
  onChange: (s: Status) => void;
}) {
  return (
    <label class={p.msg ? 'field invalid' : 'field'}>
      <span>{p.ended ? 'what came of it' : 'status'}</span>
      <select
        name="status"
        value={p.value}
        onChange={(e) => p.onChange(e.currentTarget.value as Status)}
      >
        {p.statuses.map((s) => (
          <option key={s} value={s}>
            {s}
          </option>
        ))}
      </select>
      {p.msg && <span class="field-msg">{p.msg}</span>}
    </label>
  );
}

type Rule = { field: string; rule: string };

/** The server's field messages, with the form's own check (if any) on top. */
function messagesOf(error: unknown, local: Rule | null): Record<string, string> {
  return { ...fieldMessages(error), ...(local ? { [local.field]: local.rule } : {}) };
}

/** The clock, both ends and the status: the fields the add form and the editor share. */
function BlockTimes(p: {
  clock: Clock;
  onClock: (c: Clock) => void;
  zone: string;
  ended: boolean;
  statuses: Status[];
  v: { start: string; end: string; status: Status };
  msgs: Record<string, string>;
  onChange: (change: Partial<{ start: string; end: string; status: Status }>) => void;
}) {
  const { ended, v, msgs } = p;
  return (
    <>
      <ClockChoice clock={p.clock} onClock={p.onClock} zone={p.zone} />
      <TimeField
        name="start"
        label={ended ? 'started at' : 'starts at'}
        value={v.start}
        msg={msgs.startUtc}
        onInput={(x) => p.onChange({ start: x })}
      />
      <TimeField
        name="end"
        label={ended ? 'ended at' : 'ends at'}
        value={v.end}
        msg={msgs.endUtc}
        onInput={(x) => p.onChange({ end: x })}
      />
      <StatusField
        ended={ended}
        statuses={p.statuses}
        value={v.status}
        msg={msgs.status}
        onChange={(x) => p.onChange({ status: x })}
      />
    </>
  );
}

function TargetField(p: {
  targets: Catalogue['targets'];
  value: string;
  msg: string | undefined;
  onChange: (id: string) => void;
}) {
  return (
    <label class={p.msg ? 'field invalid' : 'field'}>
      <span>target</span>
      <select name="targetId" value={p.value} onChange={(e) => p.onChange(e.currentTarget.value)}>
        {p.targets.map((t) => (
          <option key={t.id} value={t.id}>
            {t.name}
          </option>
        ))}
      </select>
      {p.msg && <span class="field-msg">{p.msg}</span>}
    </label>
  );
}

function KindField(p: { value: Kind; onChange: (k: Kind) => void }) {
  return (
    <label class="field">
      <span>kind</span>
      <select
        name="kind"
        value={p.value}
        onChange={(e) => p.onChange(e.currentTarget.value as Kind)}
      >
        {BLOCK_KINDS.map((k) => (
          <option key={k} value={k}>
            {k}
          </option>
        ))}
      </select>
    </label>
  );
}

/** The laser checkbox (only at a site with a laser guide star) and the notes. */
function LaserAndNotes(p: {
  laserSite: boolean;
  laser: boolean;
  notes: string;
  onLaser: (on: boolean) => void;
  onNotes: (text: string) => void;
}) {
  return (
    <>
      {p.laserSite && (
        <label class="field">
          <span>laser guide star</span>
          <input
            type="checkbox"
            name="laserGuideStar"
            checked={p.laser}
            onChange={(e) => p.onLaser(e.currentTarget.checked)}
          />
        </label>
      )}
      <label class="field wide">
        <span>notes</span>
        <input name="notes" value={p.notes} onInput={(e) => p.onNotes(e.currentTarget.value)} />
      </label>
    </>
  );
}

/** The add form's button, what it stored, and why nothing was. */
function AddBlockOutcome(p: {
  ended: boolean;
  busy: boolean;
  hasTargets: boolean;
  added: string;
  error: unknown;
  local: Rule | null;
  msgs: Record<string, string>;
}) {
  const { error } = p;
  return (
    <>
      <div class="toolbar">
        <button type="submit" class="primary" disabled={p.busy || !p.hasTargets}>
          {p.ended ? 'Record this block' : 'Add this block'}
        </button>
        {p.added && (
          <span class="save-status" role="status">
            {p.added}
          </span>
        )}
      </div>
      {!p.hasTargets && (
        <p class="muted">No targets to choose: the campaign of this night has none yet.</p>
      )}
      {error !== null && !Object.keys(p.msgs).length ? <ErrorLine error={error} /> : null}
      {(error !== null || p.local) && (
        <p class="muted">Nothing was stored; correct the marked field and try again.</p>
      )}
    </>
  );
}

/** The targets a block on this night may be for: its campaign's, or every one if it has none. */
function targetsOf(cat: Catalogue, night: NightRow): Catalogue['targets'] {
  const campaign = cat.campaigns.find((c) => c.id === night.campaignId);
  return campaign ? campaign.targetIds.map((id) => cat.target(id)!).filter(Boolean) : cat.targets;
}

/** What the add form holds as typed. */
interface Draft {
  targetId: string;
  kind: Kind;
  start: string;
  end: string;
  status: Status;
  laserGuideStar: boolean;
  notes: string;
}

function blankDraft(targets: Catalogue['targets'], statuses: Status[]): Draft {
  return {
    targetId: String(targets[0]?.id ?? ''),
    kind: BLOCK_KINDS[0] as Kind,
    start: '',
    end: '',
    status: statuses[0]!,
    laserGuideStar: false,
    notes: '',
  };
}

/** Store the drafted block on the night, at the instants its clock times resolved to. */
function addBlock(night: NightRow, v: Draft, t: { startUtc: string; endUtc: string }) {
  return api.POST('/blocks', {
    body: {
      nightId: night.id,
      targetId: Number(v.targetId),
      kind: v.kind,
      ...t,
      status: v.status,
      laserGuideStar: v.laserGuideStar,
      notes: v.notes,
    },
  });
}

/** Add one block to the night: what ran, once the night has ended; a block by hand, before. */
export function AddBlockForm({
  night,
  vis,
  cat,
  ended,
  onAdded,
}: {
  night: NightRow;
  vis: Visibility;
  cat: Catalogue;
  ended: boolean;
  onAdded: () => void;
}) {
  const targets = targetsOf(cat, night);
  const statuses = statusesFor(ended);
  const [clock, setClock] = useState<Clock>('site');
  const [v, setV] = useState(() => blankDraft(targets, statuses));
  const [local, setLocal] = useState<Rule | null>(null);
  const [added, setAdded] = useState('');
  const { busy, error, run } = useAction();
  const msgs = messagesOf(error, local);
  const change = (c: Partial<Draft>) => setV({ ...v, ...c });
  const submit = (e: Event) => {
    e.preventDefault();
    setLocal(null);
    setAdded('');
    const t = instants(vis, clock, v.start, v.end);
    if ('rule' in t) return setLocal(t);
    return run(async () => {
      const row = await addBlock(night, v, t);
      setAdded(`Added: ${cat.target(row.targetId)?.name} ${row.kind}, ${row.status}.`);
      setV({ ...v, start: '', end: '', notes: '' });
      onAdded();
    });
  };
  return (
    <form
      class="block-log-form"
      aria-label={ended ? 'record a block that ran' : 'add a block by hand'}
      onSubmit={submit}
      noValidate
    >
      <div class="field-grid">
        <TargetField
          targets={targets}
          value={v.targetId}
          msg={msgs.targetId}
          onChange={(targetId) => change({ targetId })}
        />
        <KindField value={v.kind} onChange={(kind) => change({ kind })} />
        <BlockTimes
          clock={clock}
          onClock={setClock}
          zone={vis.site.timeZone}
          ended={ended}
          statuses={statuses}
          v={v}
          msgs={msgs}
          onChange={change}
        />
        <LaserAndNotes
          laserSite={!!cat.site(night.siteId)?.laserGuideStar}
          laser={v.laserGuideStar}
          notes={v.notes}
          onLaser={(laserGuideStar) => change({ laserGuideStar })}
          onNotes={(notes) => change({ notes })}
        />
      </div>
      <AddBlockOutcome
        ended={ended}
        busy={busy}
        hasTargets={targets.length > 0}
        added={added}
        error={error}
        local={local}
        msgs={msgs}
      />
    </form>
  );
}

/** The fields of `block` that the typed times and status change, with its version; null if none. */
function blockChange(
  block: BlockRow,
  t: { startUtc: string; endUtc: string },
  status: Status,
): { startUtc?: string; endUtc?: string; status?: Status; version: number } | null {
  const body: { startUtc?: string; endUtc?: string; status?: Status; version: number } = {
    version: block.version,
  };
  if (ms(t.startUtc) !== ms(block.startUtc)) body.startUtc = t.startUtc;
  if (ms(t.endUtc) !== ms(block.endUtc)) body.endUtc = t.endUtc;
  if (status !== block.status) body.status = status;
  return Object.keys(body).length === 1 ? null : body;
}

/** Edit one stored block in place: its real start and end, and what came of it. */
export function BlockEditor({
  block,
  vis,
  ended,
  label,
  onDone,
}: {
  block: BlockRow;
  vis: Visibility;
  ended: boolean;
  label: string;
  onDone: (changed: boolean) => void;
}) {
  const [clock, setClock] = useState<Clock>('site');
  const zoneOf = (c: Clock) => (c === 'utc' ? 'UTC' : vis.site.timeZone);
  const [v, setV] = useState({
    start: clockOf(block.startUtc, vis.site.timeZone),
    end: clockOf(block.endUtc, vis.site.timeZone),
    status: block.status,
  });
  const [local, setLocal] = useState<Rule | null>(null);
  const { busy, error, run } = useAction();
  const msgs = messagesOf(error, local);
  // A status the night no longer allows stays on offer as it is stored, so opening the editor changes nothing.
  const statuses = [...new Set([block.status, ...statusesFor(ended)])];
  const switchClock = (c: Clock) => {
    const t = instants(vis, clock, v.start, v.end);
    if (!('rule' in t))
      setV({ ...v, start: clockOf(t.startUtc, zoneOf(c)), end: clockOf(t.endUtc, zoneOf(c)) });
    setClock(c);
  };
  const save = (e: Event) => {
    e.preventDefault();
    setLocal(null);
    const t = instants(vis, clock, v.start, v.end);
    if ('rule' in t) return setLocal(t);
    const body = blockChange(block, t, v.status);
    if (!body) return onDone(false);
    return run(async () => {
      await api.PATCH('/blocks/{id}', { params: { path: { id: block.id } }, body });
      onDone(true);
    });
  };
  return (
    <form class="block-editor" aria-label={`edit ${label}`} onSubmit={save} noValidate>
      <div class="field-grid">
        <BlockTimes
          clock={clock}
          onClock={switchClock}
          zone={vis.site.timeZone}
          ended={ended}
          statuses={statuses}
          v={v}
          msgs={msgs}
          onChange={(c) => setV({ ...v, ...c })}
        />
      </div>
      <div class="toolbar">
        <button type="submit" class="primary" disabled={busy}>
          Save block
        </button>
        <button type="button" onClick={() => onDone(false)}>
          Cancel
        </button>
      </div>
      {error !== null && !Object.keys(msgs).length ? <ErrorLine error={error} /> : null}
    </form>
  );
}
