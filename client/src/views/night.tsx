/**
 * One night at one site: the lane chart (darkness, the Moon, each sky position's airmass and
 * closing limits, the blocks in their lanes, now) with its text twin and one lane's altitude in
 * detail; the night's blocks in a table
 * (UTC and the site’s clock side by side, where each came from and whether it is pinned) where
 * observers move, pin and remove them; the scheduler panel; the site's cautions; and a printable
 * night sheet.
 */
import type { ComponentChildren } from 'preact';
import { useState } from 'preact/hooks';
import { ApiError, getAll, api } from '../api/client.ts';
import { loadCatalogue } from '../api/catalogue.ts';
import type { BlockOrigin, BlockRow, Visibility } from '../api/client.ts';
import { NightChart } from '../plots/night-chart.tsx';
import { NightDetail } from '../plots/night-detail.tsx';
import type { ChartClock } from '../plots/night-frame.tsx';
import { chartSpan } from '../plots/night-layout.ts';
import { airmassBins, fillCeiling, laneModels, visTargetOf } from '../plots/night-lanes.ts';
import { laneSentence, shortName } from '../plots/night-text.ts';
import { isoOf, ms, utcClock, zoneAbbrev, zoneClock } from '../lib/time.ts';
import { Caution, ErrorLine, Loading, Qty, Section, useCan } from '../lib/ui.tsx';
import { useLoad } from '../lib/use-load.ts';
import { AddBlockForm, BlockEditor, nightEnded } from './block-log.tsx';
import { SchedulePanel, type ScheduledBlock } from './schedule-panel.tsx';

const STEP_MIN = 15;

/** How the blocks table says where a stored block came from. */
export const ORIGIN_LABEL: Record<BlockOrigin, string> = {
  'season-plan': 'season plan',
  'night-schedule': 'night schedule',
  'by-hand': 'by hand',
};

/** Why a stored block sits outside what the sky engine allows for its target tonight, or null. */
export function blockProblem(
  b: BlockRow,
  vis: Visibility,
  targetName: string,
  siteLeastSunDistanceDeg: number,
): string | null {
  const t = visTargetOf(vis.targets, targetName);
  if (!t) return null;
  if (t.sunSeparationDeg < siteLeastSunDistanceDeg)
    return (
      `refused: ${t.sunSeparationDeg.toFixed(0)}° from the Sun, inside the site’s ` +
      `${siteLeastSunDistanceDeg}° Sun-avoidance angle`
    );
  const s = ms(b.startUtc);
  const e = ms(b.endUtc);
  if (!t.windows.some((w) => ms(w.start.utc) <= s + 1000 && ms(w.end.utc) >= e - 1000))
    return 'outside the target’s observable window tonight (darkness, altitude, airmass or Moon limit)';
  return null;
}

type BlockChange = {
  setPinned: (b: BlockRow, pinned: boolean) => void;
  shift: (b: BlockRow, minutes: number) => void;
  remove: (b: BlockRow) => void;
};

/** The calls behind the table's buttons, each run through `act` (which reports and reloads). */
function blockChanges(act: (f: () => Promise<unknown>) => void): BlockChange {
  return {
    setPinned: (b, pinned) =>
      act(() =>
        api.PATCH('/blocks/{id}', {
          params: { path: { id: b.id } },
          body: { pinned, version: b.version },
        }),
      ),
    shift: (b, minutes) =>
      act(() =>
        api.PATCH('/blocks/{id}', {
          params: { path: { id: b.id } },
          body: {
            startUtc: isoOf(ms(b.startUtc) + minutes * 60_000),
            endUtc: isoOf(ms(b.endUtc) + minutes * 60_000),
            version: b.version,
          },
        }),
      ),
    remove: (b) => act(() => api.DELETE('/blocks/{id}', { params: { path: { id: b.id } } })),
  };
}

function BlockTable({
  blocks,
  vis,
  names,
  zone,
  leastSunDistance,
  canEdit,
  ended,
  onChanged,
}: {
  blocks: BlockRow[];
  vis: Visibility;
  names: (id: number) => string;
  zone: string;
  leastSunDistance: number;
  canEdit: boolean;
  ended: boolean;
  onChanged: () => void;
}) {
  const [error, setError] = useState<unknown>(null);
  const [editing, setEditing] = useState<number | null>(null);
  const act = async (f: () => Promise<unknown>) => {
    setError(null);
    try {
      await f();
    } catch (e) {
      setError(e);
    }
    onChanged();
  };
  const change = blockChanges(act);
  if (!blocks.length)
    return (
      <p class="muted">
        {ended
          ? 'No blocks were stored for this night: record below what ran.'
          : 'No blocks on this night yet.'}
      </p>
    );
  return (
    <>
      <p class="muted pin-note" hidden={ended}>
        A stored night schedule or season plan never replaces a pinned block or one made by hand,
        nor one already begun, reported or measured. Pin a block to keep it where it is through the
        next re-plan.
      </p>
      <table class="data blocks">
        <BlockTableHead zone={zone} firstUtc={blocks[0]!.startUtc} canEdit={canEdit} />
        <tbody>
          {blocks.map((b) => (
            <BlockEntry
              key={b.id}
              b={b}
              vis={vis}
              name={names(b.targetId)}
              problem={blockProblem(b, vis, names(b.targetId), leastSunDistance)}
              zone={zone}
              canEdit={canEdit}
              ended={ended}
              editing={editing === b.id}
              onEdit={() => setEditing(editing === b.id ? null : b.id)}
              onDone={(changed) => {
                setEditing(null);
                if (changed) onChanged();
              }}
              change={change}
            />
          ))}
        </tbody>
      </table>
      <ErrorLine error={error} />
      {error instanceof ApiError && error.status === 409 && (
        <p class="muted" role="status">
          Someone changed this block first; the table now shows it as stored.
        </p>
      )}
    </>
  );
}

function BlockTableHead(p: { zone: string; firstUtc: string; canEdit: boolean }) {
  return (
    <thead>
      <tr>
        <th>target</th>
        <th>kind</th>
        <th>UTC</th>
        <th>
          {zoneAbbrev(p.firstUtc, p.zone)} ({p.zone})
        </th>
        <th>status</th>
        <th>made by</th>
        <th>pinned</th>
        <th>check</th>
        {p.canEdit && <th>change</th>}
      </tr>
    </thead>
  );
}

/** One block's row and, while it is being edited, the editor row under it. */
function BlockEntry(p: {
  b: BlockRow;
  vis: Visibility;
  name: string;
  problem: string | null;
  zone: string;
  canEdit: boolean;
  ended: boolean;
  editing: boolean;
  onEdit: () => void;
  onDone: (changed: boolean) => void;
  change: BlockChange;
}) {
  const { b } = p;
  const label = `${p.name} ${b.kind} ${utcClock(b.startUtc)} UTC`;
  return (
    <>
      <BlockLine b={b} name={p.name} problem={p.problem} zone={p.zone}>
        {p.canEdit && (
          <BlockActions
            b={b}
            name={p.name}
            label={label}
            ended={p.ended}
            editing={p.editing}
            onEdit={p.onEdit}
            change={p.change}
          />
        )}
      </BlockLine>
      {p.editing && (
        <tr class="edit-row">
          <td colSpan={p.canEdit ? 9 : 8}>
            <BlockEditor block={b} vis={p.vis} ended={p.ended} label={label} onDone={p.onDone} />
          </td>
        </tr>
      )}
    </>
  );
}

/** One stored block's row; its children are the last cell (the buttons), if any. */
function BlockLine(p: {
  b: BlockRow;
  name: string;
  problem: string | null;
  zone: string;
  children: ComponentChildren;
}) {
  const { b, zone, problem } = p;
  return (
    <tr data-block={b.id} data-version={b.version} class={problem ? 'has-problem' : ''}>
      <td>
        <a href={`/targets/${b.targetId}`}>{p.name}</a>
      </td>
      <td>
        {b.kind}
        {b.laserGuideStar && <span class="tag lgs-tag">laser guide star</span>}
      </td>
      <td>
        {utcClock(b.startUtc)}–{utcClock(b.endUtc)}
      </td>
      <td>
        {zoneClock(b.startUtc, zone)}–{zoneClock(b.endUtc, zone)}
      </td>
      <td>{b.status}</td>
      <td class="origin">{ORIGIN_LABEL[b.origin] ?? b.origin}</td>
      <td class="pin-state">
        {b.pinned ? <span class="tag pin-tag">pinned</span> : <span class="muted">no</span>}
      </td>
      <td>
        {problem ? (
          <span class="problem">{problem}</span>
        ) : (
          <span class="ok">inside its window</span>
        )}
      </td>
      {p.children}
    </tr>
  );
}

/** Edit, pin or unpin, move and remove buttons for one block. */
function BlockActions(p: {
  b: BlockRow;
  name: string;
  label: string;
  ended: boolean;
  editing: boolean;
  onEdit: () => void;
  change: BlockChange;
}) {
  const { b, change } = p;
  const what = `${p.name} ${b.kind}`;
  return (
    <td class="actions">
      <button
        type="button"
        aria-label={`edit ${p.label}`}
        aria-expanded={p.editing}
        onClick={p.onEdit}
      >
        {p.ended ? 'Log times and outcome' : 'Edit'}
      </button>
      {b.pinned ? (
        <button
          type="button"
          aria-label={`unpin ${what}`}
          onClick={() => change.setPinned(b, false)}
        >
          Unpin
        </button>
      ) : (
        <button type="button" aria-label={`pin ${what}`} onClick={() => change.setPinned(b, true)}>
          Pin
        </button>
      )}
      <button
        type="button"
        aria-label={`move ${what} ${STEP_MIN} minutes earlier`}
        onClick={() => change.shift(b, -STEP_MIN)}
      >
        −{STEP_MIN} min
      </button>
      <button
        type="button"
        aria-label={`move ${what} ${STEP_MIN} minutes later`}
        onClick={() => change.shift(b, STEP_MIN)}
      >
        +{STEP_MIN} min
      </button>
      <button
        type="button"
        class="danger"
        aria-label={`remove ${what}`}
        onClick={() => change.remove(b)}
      >
        Remove
      </button>
    </td>
  );
}

export function NightView({ id }: { id: number }) {
  const canEdit = useCan('observer');
  const [tick, setTick] = useState(0);
  const [proposal, setProposal] = useState<ScheduledBlock[] | null>(null);
  const { data, error } = useLoad(async () => {
    const cat = await loadCatalogue();
    const night = await api.GET('/nights/{id}', { params: { path: { id } } });
    const [vis, blocks] = await Promise.all([
      api.GET('/nights/{id}/visibility', {
        params: { path: { id }, query: { curves: 'true' } },
      }),
      getAll('/blocks', { nightId: id }),
    ]);
    return { cat, night, vis, blocks: blocks.sort((a, b) => a.startUtc.localeCompare(b.startUtc)) };
  }, [id, tick]);
  if (error) return <ErrorLine error={error} />;
  if (!data) return <Loading what="the night" />;
  const { cat, night, vis, blocks } = data;
  const site = cat.site(night.siteId)!;
  const names = (tid: number) => cat.target(tid)?.name ?? `#${tid}`;
  const zone = site.timeZone;
  const ended = nightEnded(vis, Date.now());
  const reload = () => setTick(tick + 1);
  return (
    <div class="view night">
      <NightHead id={id} title={`${site.name}, night of ${night.date}`} zone={zone} vis={vis} />
      <NightCautions vis={vis} blocks={blocks} />
      <NightChartSection vis={vis} blocks={blocks} names={names} proposal={proposal} />
      <SunMoonTimes vis={vis} zone={zone} />
      <Section title="Blocks" id="blocks">
        <BlockTable
          blocks={blocks}
          vis={vis}
          names={names}
          zone={zone}
          leastSunDistance={site.leastSunDistanceDeg}
          canEdit={canEdit}
          ended={ended}
          onChanged={reload}
        />
      </Section>
      {canEdit && (
        <AddBlockSection id={id} night={night} vis={vis} cat={cat} ended={ended} onAdded={reload} />
      )}
      {ended ? (
        <Section title="Scheduler" id="scheduler">
          <p class="muted">
            The scheduler plans nights ahead only; this one has ended. Its blocks are recorded above
            as they ran.
          </p>
        </Section>
      ) : (
        <SchedulePanel
          night={night}
          blocks={blocks}
          cat={cat}
          canEdit={canEdit}
          onChanged={reload}
          onProposal={setProposal}
        />
      )}
    </div>
  );
}

/** The night's title, darkness and Moon line, and its report and print links. */
function NightHead(p: { id: number; title: string; zone: string; vis: Visibility }) {
  const { vis } = p;
  return (
    <div class="view-head">
      <h1>{p.title}</h1>
      <p class="muted">
        {p.zone} · darkness ({vis.darkness.limit}) <Qty v={vis.darkness.hours} unit="h" /> · Moon{' '}
        {Math.round(vis.moon.illuminatedFraction * 100)}% illuminated
      </p>
      <div class="toolbar no-print">
        <a href={`/nights/${p.id}/report`} class="button">
          Night report
        </a>
        <button type="button" onClick={() => print()}>
          Print night sheet
        </button>
      </div>
    </div>
  );
}

/** The site's cautions for the night, and the laser one when any block propagates a laser. */
function NightCautions({ vis, blocks }: { vis: Visibility; blocks: BlockRow[] }) {
  return (
    <>
      {vis.cautions.map((c) => (
        <Caution key={c}>{c}</Caution>
      ))}
      {blocks.some((b) => b.laserGuideStar) && (
        <Caution>
          Blocks marked “laser guide star” propagate a laser: coordinate with the site’s
          laser-traffic system and stop whenever the site’s spotters or the aviation authority say
          so.
        </Caution>
      )}
    </>
  );
}

/** Adding a block by hand, or after the night recording what ran. */
function AddBlockSection(
  p: {
    id: number;
    ended: boolean;
    onAdded: () => void;
  } & Pick<Parameters<typeof AddBlockForm>[0], 'night' | 'vis' | 'cat'>,
) {
  const { ended } = p;
  return (
    <Section title={ended ? 'Record what ran' : 'Add a block by hand'} id="add-block">
      <p class="muted">
        {ended
          ? 'This night has ended. Record each block as it ran, with its real start and end; then write the ' +
            'night report and add the measurements.'
          : 'A block made by hand is kept by every re-plan, like a pinned one.'}
      </p>
      <AddBlockForm night={p.night} vis={p.vis} cat={p.cat} ended={ended} onAdded={p.onAdded} />
      {ended && (
        <p>
          <a href={`/nights/${p.id}/report`}>Write the night report →</a>
        </p>
      )}
    </Section>
  );
}

/** The chart's text twin and the altitude detail of one lane. */
function NightWords(p: {
  vis: Visibility;
  detail: number;
  onDetail: (i: number) => void;
  clock: ChartClock;
}) {
  const { vis } = p;
  const lanes = laneModels(vis, chartSpan(vis), airmassBins(fillCeiling(vis)));
  const lane = lanes[Math.min(p.detail, lanes.length - 1)];
  return (
    <>
      <details class="chart-text" id="night-chart-text">
        <summary>The night in words</summary>
        <ul>
          {lanes.map((l) => (
            <li key={l.members[0]!.name}>{laneSentence(l, vis)}</li>
          ))}
        </ul>
      </details>
      {lane && (
        <div class="night-detail-panel">
          <label class="inline">
            altitude of{' '}
            <select
              name="detail"
              value={lanes.indexOf(lane)}
              onChange={(e) => p.onDetail(Number(e.currentTarget.value))}
            >
              {lanes.map((l, i) => (
                <option key={l.members[0]!.name} value={i}>
                  {l.members.map(shortName).join(', ')}
                </option>
              ))}
            </select>
          </label>
          <NightDetail
            vis={vis}
            target={lane.members[0]!}
            zone={p.clock === 'utc' ? 'UTC' : vis.site.timeZone}
          />
        </div>
      )}
    </>
  );
}

/** Sunset, twilight, darkness and Moon times on both clocks. */
function SunMoonTimes({ vis, zone }: { vis: Visibility; zone: string }) {
  const dark = vis.darkness.intervals;
  // A time the night does not have says so: the Sun or Moon stays above or below all night.
  const both = (iso: string | null | undefined, none = 'does not occur this night') =>
    iso ? (
      <>
        {utcClock(iso)} UTC · {zoneClock(iso, zone)} local
      </>
    ) : (
      <span class="muted">{none}</span>
    );
  return (
    <Section title="Sun, twilight and Moon" id="sun-moon">
      <table class="data times">
        <tbody>
          <tr>
            <th>sunset</th>
            <td>{both(vis.sun.set?.utc)}</td>
            <th>sunrise</th>
            <td>{both(vis.sun.rise?.utc)}</td>
          </tr>
          <tr>
            <th>astronomical dusk (−18°)</th>
            <td>
              {both(vis.sun.twilights.astronomical.dusk?.utc, 'none: the Sun stays above −18°')}
            </td>
            <th>astronomical dawn</th>
            <td>
              {both(vis.sun.twilights.astronomical.dawn?.utc, 'none: the Sun stays above −18°')}
            </td>
          </tr>
          <tr>
            <th>darkness starts</th>
            <td>{both(dark[0]?.start.utc, 'no darkness this night')}</td>
            <th>darkness ends</th>
            <td>{both(dark[dark.length - 1]?.end.utc, 'no darkness this night')}</td>
          </tr>
          <tr>
            <th>moonrise</th>
            <td>{both(vis.moon.rise?.utc, 'the Moon does not rise between noon and noon')}</td>
            <th>moonset</th>
            <td>{both(vis.moon.set?.utc, 'the Moon does not set between noon and noon')}</td>
          </tr>
          <tr>
            <th>Moon crosses the meridian</th>
            <td>
              {both(
                vis.moon.transit?.utc,
                'not between noon and noon (the Moon’s day is about 24.8 h)',
              )}
            </td>
            <th>Moon lit</th>
            <td>{Math.round(vis.moon.illuminatedFraction * 100)} %</td>
          </tr>
        </tbody>
      </table>
      <p class="muted refraction">Altitudes and airmasses include {vis.site.refraction}.</p>
    </Section>
  );
}

/** The lane chart with its clock switch, its text twin and one lane's altitude. */
function NightChartSection(p: {
  vis: Visibility;
  blocks: BlockRow[];
  names: (id: number) => string;
  proposal: ScheduledBlock[] | null;
}) {
  const [clock, setClock] = useState<ChartClock>('site');
  const [detail, setDetail] = useState(0);
  return (
    <Section title="The night" id="night-chart">
      <label class="inline no-print">
        clock{' '}
        <select
          name="clock"
          value={clock}
          onChange={(e) => setClock(e.currentTarget.value as ChartClock)}
        >
          <option value="site">site ({p.vis.site.timeZone})</option>
          <option value="utc">UTC</option>
        </select>
      </label>
      <NightChart
        vis={p.vis}
        blocks={p.blocks}
        targetName={p.names}
        nowMs={Date.now()}
        clock={clock}
        proposed={p.proposal ?? undefined}
      />
      <NightWords vis={p.vis} detail={detail} onDetail={setDetail} clock={clock} />
    </Section>
  );
}
