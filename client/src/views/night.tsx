/**
 * One night at one site: the lane chart (darkness, the Moon, each sky position's airmass and
 * closing limits, the blocks in their lanes, now) with its text twin and one lane's altitude in
 * detail; the night's blocks in a table
 * (UTC and the site’s clock side by side, where each came from and whether it is pinned) where
 * observers move, pin and remove them; the scheduler panel; the site's cautions; and a printable
 * night sheet.
 */
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
    return `refused: ${t.sunSeparationDeg.toFixed(0)}° from the Sun, inside the site’s ${siteLeastSunDistanceDeg}° Sun-avoidance angle`;
  const s = ms(b.startUtc);
  const e = ms(b.endUtc);
  if (!t.windows.some((w) => ms(w.start.utc) <= s + 1000 && ms(w.end.utc) >= e - 1000))
    return 'outside the target’s observable window tonight (darkness, altitude, airmass or Moon limit)';
  return null;
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
  const setPinned = (b: BlockRow, pinned: boolean) =>
    act(() =>
      api.PATCH('/blocks/{id}', {
        params: { path: { id: b.id } },
        body: { pinned, version: b.version },
      }),
    );
  const shift = (b: BlockRow, minutes: number) =>
    act(() =>
      api.PATCH('/blocks/{id}', {
        params: { path: { id: b.id } },
        body: {
          startUtc: isoOf(ms(b.startUtc) + minutes * 60_000),
          endUtc: isoOf(ms(b.endUtc) + minutes * 60_000),
          version: b.version,
        },
      }),
    );
  if (!blocks.length)
    return (
      <p class="muted">
        {ended
          ? 'No blocks were stored for this night: record below what ran.'
          : 'No blocks on this night yet.'}
      </p>
    );
  const columns = canEdit ? 9 : 8;
  return (
    <>
      <p class="muted pin-note" hidden={ended}>
        A stored night schedule or season plan never replaces a pinned block or one made by hand,
        nor one already begun, reported or measured. Pin a block to keep it where it is through the
        next re-plan.
      </p>
      <table class="data blocks">
        <thead>
          <tr>
            <th>target</th>
            <th>kind</th>
            <th>UTC</th>
            <th>
              {zoneAbbrev(blocks[0]!.startUtc, zone)} ({zone})
            </th>
            <th>status</th>
            <th>made by</th>
            <th>pinned</th>
            <th>check</th>
            {canEdit && <th>change</th>}
          </tr>
        </thead>
        <tbody>
          {blocks.map((b) => {
            const problem = blockProblem(b, vis, names(b.targetId), leastSunDistance);
            const label = `${names(b.targetId)} ${b.kind} ${utcClock(b.startUtc)} UTC`;
            return [
              <tr
                key={b.id}
                data-block={b.id}
                data-version={b.version}
                class={problem ? 'has-problem' : ''}
              >
                <td>
                  <a href={`/targets/${b.targetId}`}>{names(b.targetId)}</a>
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
                  {b.pinned ? (
                    <span class="tag pin-tag">pinned</span>
                  ) : (
                    <span class="muted">no</span>
                  )}
                </td>
                <td>
                  {problem ? (
                    <span class="problem">{problem}</span>
                  ) : (
                    <span class="ok">inside its window</span>
                  )}
                </td>
                {canEdit && (
                  <td class="actions">
                    <button
                      type="button"
                      aria-label={`edit ${label}`}
                      aria-expanded={editing === b.id}
                      onClick={() => setEditing(editing === b.id ? null : b.id)}
                    >
                      {ended ? 'Log times and outcome' : 'Edit'}
                    </button>
                    {b.pinned ? (
                      <button
                        type="button"
                        aria-label={`unpin ${names(b.targetId)} ${b.kind}`}
                        onClick={() => setPinned(b, false)}
                      >
                        Unpin
                      </button>
                    ) : (
                      <button
                        type="button"
                        aria-label={`pin ${names(b.targetId)} ${b.kind}`}
                        onClick={() => setPinned(b, true)}
                      >
                        Pin
                      </button>
                    )}
                    <button
                      type="button"
                      aria-label={`move ${names(b.targetId)} ${b.kind} ${STEP_MIN} minutes earlier`}
                      onClick={() => shift(b, -STEP_MIN)}
                    >
                      −{STEP_MIN} min
                    </button>
                    <button
                      type="button"
                      aria-label={`move ${names(b.targetId)} ${b.kind} ${STEP_MIN} minutes later`}
                      onClick={() => shift(b, STEP_MIN)}
                    >
                      +{STEP_MIN} min
                    </button>
                    <button
                      type="button"
                      class="danger"
                      aria-label={`remove ${names(b.targetId)} ${b.kind}`}
                      onClick={() =>
                        act(() => api.DELETE('/blocks/{id}', { params: { path: { id: b.id } } }))
                      }
                    >
                      Remove
                    </button>
                  </td>
                )}
              </tr>,
              editing === b.id && (
                <tr key={`${b.id}-edit`} class="edit-row">
                  <td colSpan={columns}>
                    <BlockEditor
                      block={b}
                      vis={vis}
                      ended={ended}
                      label={label}
                      onDone={(changed) => {
                        setEditing(null);
                        if (changed) onChanged();
                      }}
                    />
                  </td>
                </tr>
              ),
            ];
          })}
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
  return (
    <div class="view night">
      <div class="view-head">
        <h1>
          {site.name}, night of {night.date}
        </h1>
        <p class="muted">
          {zone} · darkness ({vis.darkness.limit}) <Qty v={vis.darkness.hours} unit="h" /> · Moon{' '}
          {Math.round(vis.moon.illuminatedFraction * 100)}% illuminated
        </p>
        <div class="toolbar no-print">
          <a href={`/nights/${id}/report`} class="button">
            Night report
          </a>
          <button type="button" onClick={() => print()}>
            Print night sheet
          </button>
        </div>
      </div>
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
          onChanged={() => setTick(tick + 1)}
        />
      </Section>
      {canEdit && (
        <Section title={ended ? 'Record what ran' : 'Add a block by hand'} id="add-block">
          <p class="muted">
            {ended
              ? 'This night has ended. Record each block as it ran, with its real start and end; then write the night report and add the measurements.'
              : 'A block made by hand is kept by every re-plan, like a pinned one.'}
          </p>
          <AddBlockForm
            night={night}
            vis={vis}
            cat={cat}
            ended={ended}
            onAdded={() => setTick(tick + 1)}
          />
          {ended && (
            <p>
              <a href={`/nights/${id}/report`}>Write the night report →</a>
            </p>
          )}
        </Section>
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
          onChanged={() => setTick(tick + 1)}
          onProposal={setProposal}
        />
      )}
    </div>
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
