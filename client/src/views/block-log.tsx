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
  const campaign = cat.campaigns.find((c) => c.id === night.campaignId);
  const targets = campaign
    ? campaign.targetIds.map((id) => cat.target(id)!).filter(Boolean)
    : cat.targets;
  const site = cat.site(night.siteId);
  const statuses = statusesFor(ended);
  const [clock, setClock] = useState<Clock>('site');
  const [v, setV] = useState({
    targetId: String(targets[0]?.id ?? ''),
    kind: BLOCK_KINDS[0] as Kind,
    start: '',
    end: '',
    status: statuses[0]!,
    laserGuideStar: false,
    notes: '',
  });
  const [local, setLocal] = useState<{ field: string; rule: string } | null>(null);
  const [added, setAdded] = useState('');
  const { busy, error, run } = useAction();
  const msgs = { ...fieldMessages(error), ...(local ? { [local.field]: local.rule } : {}) };
  const set = (k: keyof typeof v, x: string | boolean) => setV({ ...v, [k]: x });
  const submit = (e: Event) => {
    e.preventDefault();
    setLocal(null);
    setAdded('');
    const t = instants(vis, clock, v.start, v.end);
    if ('rule' in t) return setLocal(t);
    return run(async () => {
      const row = await api.POST('/blocks', {
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
        <label class={msgs.targetId ? 'field invalid' : 'field'}>
          <span>target</span>
          <select
            name="targetId"
            value={v.targetId}
            onChange={(e) => set('targetId', e.currentTarget.value)}
          >
            {targets.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name}
              </option>
            ))}
          </select>
          {msgs.targetId && <span class="field-msg">{msgs.targetId}</span>}
        </label>
        <label class="field">
          <span>kind</span>
          <select name="kind" value={v.kind} onChange={(e) => set('kind', e.currentTarget.value)}>
            {BLOCK_KINDS.map((k) => (
              <option key={k} value={k}>
                {k}
              </option>
            ))}
          </select>
        </label>
        <ClockChoice clock={clock} onClock={setClock} zone={vis.site.timeZone} />
        <TimeField
          name="start"
          label={ended ? 'started at' : 'starts at'}
          value={v.start}
          msg={msgs.startUtc}
          onInput={(x) => set('start', x)}
        />
        <TimeField
          name="end"
          label={ended ? 'ended at' : 'ends at'}
          value={v.end}
          msg={msgs.endUtc}
          onInput={(x) => set('end', x)}
        />
        <StatusField
          ended={ended}
          statuses={statuses}
          value={v.status}
          msg={msgs.status}
          onChange={(x) => set('status', x)}
        />
        {site?.laserGuideStar && (
          <label class="field">
            <span>laser guide star</span>
            <input
              type="checkbox"
              name="laserGuideStar"
              checked={v.laserGuideStar}
              onChange={(e) => set('laserGuideStar', e.currentTarget.checked)}
            />
          </label>
        )}
        <label class="field wide">
          <span>notes</span>
          <input
            name="notes"
            value={v.notes}
            onInput={(e) => set('notes', e.currentTarget.value)}
          />
        </label>
      </div>
      <div class="toolbar">
        <button type="submit" class="primary" disabled={busy || !targets.length}>
          {ended ? 'Record this block' : 'Add this block'}
        </button>
        {added && (
          <span class="save-status" role="status">
            {added}
          </span>
        )}
      </div>
      {!targets.length && (
        <p class="muted">No targets to choose: the campaign of this night has none yet.</p>
      )}
      {error !== null && !Object.keys(msgs).length ? <ErrorLine error={error} /> : null}
      {(error !== null || local) && (
        <p class="muted">Nothing was stored; correct the marked field and try again.</p>
      )}
    </form>
  );
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
  const [local, setLocal] = useState<{ field: string; rule: string } | null>(null);
  const { busy, error, run } = useAction();
  const msgs = { ...fieldMessages(error), ...(local ? { [local.field]: local.rule } : {}) };
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
    const body: { startUtc?: string; endUtc?: string; status?: Status; version: number } = {
      version: block.version,
    };
    if (ms(t.startUtc) !== ms(block.startUtc)) body.startUtc = t.startUtc;
    if (ms(t.endUtc) !== ms(block.endUtc)) body.endUtc = t.endUtc;
    if (v.status !== block.status) body.status = v.status;
    if (Object.keys(body).length === 1) return onDone(false);
    return run(async () => {
      await api.PATCH('/blocks/{id}', { params: { path: { id: block.id } }, body });
      onDone(true);
    });
  };
  return (
    <form class="block-editor" aria-label={`edit ${label}`} onSubmit={save} noValidate>
      <div class="field-grid">
        <ClockChoice clock={clock} onClock={switchClock} zone={vis.site.timeZone} />
        <TimeField
          name="start"
          label={ended ? 'started at' : 'starts at'}
          value={v.start}
          msg={msgs.startUtc}
          onInput={(x) => setV({ ...v, start: x })}
        />
        <TimeField
          name="end"
          label={ended ? 'ended at' : 'ends at'}
          value={v.end}
          msg={msgs.endUtc}
          onInput={(x) => setV({ ...v, end: x })}
        />
        <StatusField
          ended={ended}
          statuses={statuses}
          value={v.status}
          msg={msgs.status}
          onChange={(x) => setV({ ...v, status: x })}
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
