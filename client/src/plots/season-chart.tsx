/**
 * A year at one site as heat strips: the hours of darkness each night, then one strip per sky
 * position whose cells are the observable hours of each night (one colour scale for both, in
 * hour classes), and under it one track per star with its periapsis ± 1σ as a span and the
 * nights planned (filled) or proposed (hollow). Geometry lives in season-grid.ts.
 */
import { utcText } from '../lib/time.ts';
import { clockAt } from './time-axis.ts';
import {
  HOUR_EDGES,
  SEASON_MARGIN,
  hourOpacity,
  hourRuns,
  nightIndex,
  periapsisSpan,
  seasonAxis,
  seasonLayout,
  stripGroups,
  type SeasonAxis,
  type StripBox,
} from './season-grid.ts';

export interface SeasonPeriapsis {
  epoch: string;
  /** Linear 1σ of the date, days; absent without a covariance. */
  sigmaDays?: number;
  inSeason?: boolean;
}
export interface SeasonRow {
  name: string;
  /** The system the star belongs to, for the strip's label. */
  system?: string;
  hoursPerNight: number[];
  periapses: SeasonPeriapsis[];
  plannedDates: string[];
  /** Nights of a proposed plan, not yet stored. */
  proposedDates?: string[];
  seasonText: string;
}
export interface SeasonChartProps {
  year: number;
  /** The site's IANA zone: nights run from local noon to local noon. */
  zone: string;
  rows: SeasonRow[];
  darkHours: number[];
  nowMs?: number;
  width?: number;
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const DAY = 86_400_000;

/** "Mar 03" for night i of the year. */
export const nightLabel = (year: number, i: number) => {
  const d = new Date(Date.UTC(year, 0, 1) + i * DAY);
  return `${MONTHS[d.getUTCMonth()]} ${String(d.getUTCDate()).padStart(2, '0')}`;
};

export function SeasonChart(props: SeasonChartProps) {
  const width = props.width ?? 1100;
  const n = props.darkHours.length || 365;
  const groups = stripGroups(props.rows);
  const lay = seasonLayout(groups.map((g) => g.length));
  const ax = seasonAxis(props.year, n, props.zone, SEASON_MARGIN.left, width - SEASON_MARGIN.right);
  return (
    <svg
      class="plot season-chart"
      viewBox={`0 0 ${width} ${lay.height}`}
      role="img"
      aria-label={`observable hours per night at each sky position across ${props.year}, with periapsis spans and planned nights`}
    >
      <MonthAxis ax={ax} year={props.year} top={lay.axisY} bottom={lay.keyY - 8} />
      <HourStrip
        ax={ax}
        box={lay.dark}
        year={props.year}
        hours={props.darkHours}
        cls="dark-strip"
        label="darkness"
        sub="hours of dark"
        right={`up to ${Math.max(0, ...props.darkHours).toFixed(1)} h`}
      />
      {groups.map((g, k) => (
        <g
          class="season-row"
          key={g[0]!.name}
          data-target={g[0]!.name}
          data-targets={g.map((r) => r.name).join('|')}
        >
          <HourStrip
            ax={ax}
            box={lay.strips[k]!}
            year={props.year}
            hours={g[0]!.hoursPerNight}
            cls="target-strip"
            label={g.length > 1 ? (g[0]!.system ?? g[0]!.name) : g[0]!.name}
            sub=""
            right={g[0]!.seasonText}
          />
          {g.map((r, m) => (
            <MemberTrack
              key={r.name}
              ax={ax}
              y={lay.strips[k]!.tracks[m]!}
              row={r}
              year={props.year}
            />
          ))}
        </g>
      ))}
      <SeasonKey ax={ax} y={lay.keyY} />
      {props.nowMs !== undefined && (
        <NowCaret
          ax={ax}
          nowMs={props.nowMs}
          top={lay.axisY}
          bottom={lay.keyY - 8}
          zone={props.zone}
        />
      )}
    </svg>
  );
}

function MonthAxis({
  ax,
  year,
  top,
  bottom,
}: {
  ax: SeasonAxis;
  year: number;
  top: number;
  bottom: number;
}) {
  return (
    <g class="month-axis">
      {MONTHS.map((m, i) => {
        const a = nightIndex(`${year}-${String(i + 1).padStart(2, '0')}-01`, year);
        const b =
          i === 11
            ? nightIndex(`${year + 1}-01-01`, year)
            : nightIndex(`${year}-${String(i + 2).padStart(2, '0')}-01`, year);
        return (
          <g key={m}>
            <line class="month-line" x1={ax.cell(a)} x2={ax.cell(a)} y1={top + 4} y2={bottom} />
            <text x={(ax.cell(a) + ax.cell(b)) / 2} y={top} text-anchor="middle">
              {m}
            </text>
          </g>
        );
      })}
      <text class="axis-note" x={ax.left - 8} y={top} text-anchor="end">{`nights of ${year}`}</text>
    </g>
  );
}

function HourStrip(p: {
  ax: SeasonAxis;
  box: StripBox;
  year: number;
  hours: readonly number[];
  cls: string;
  label: string;
  sub: string;
  right: string;
}) {
  const { ax, box } = p;
  return (
    <g class={p.cls}>
      <rect class="strip-ground" x={ax.left} y={box.y} width={ax.right - ax.left} height={box.h} />
      {hourRuns(p.hours).map((r) => (
        <rect
          key={r.first}
          class="hours-cell"
          data-first={r.first}
          data-last={r.last}
          data-class={r.cls}
          x={ax.cell(r.first)}
          y={box.y}
          width={ax.cell(r.last + 1) - ax.cell(r.first)}
          height={box.h}
          fill-opacity={hourOpacity(r.cls)}
        >
          <title>{`${nightLabel(p.year, r.first)}${r.last > r.first ? ` – ${nightLabel(p.year, r.last)}` : ''}: ${r.lo.toFixed(1)}${r.hi > r.lo + 0.05 ? `–${r.hi.toFixed(1)}` : ''} h`}</title>
        </rect>
      ))}
      <text class="strip-name" x={ax.left - 8} y={box.y + 12} text-anchor="end">
        {p.label}
      </text>
      {p.sub && (
        <text class="strip-sub" x={ax.left - 8} y={box.y + 24} text-anchor="end">
          {p.sub}
        </text>
      )}
      <text class="strip-right" x={ax.right + 8} y={box.y + 12}>
        {p.right}
      </text>
    </g>
  );
}

function MemberTrack({
  ax,
  y,
  row,
  year,
}: {
  ax: SeasonAxis;
  y: number;
  row: SeasonRow;
  year: number;
}) {
  const inYear = (d: string) => d.startsWith(String(year));
  const centre = (d: string) => ax.cell(nightIndex(d, year)) + ax.cellW / 2;
  return (
    <g class="member-track" data-target={row.name}>
      <text class="track-name" x={ax.left - 8} y={y + 9} text-anchor="end">
        {row.name}
      </text>
      <line class="track-line" x1={ax.left} x2={ax.right} y1={y + 5} y2={y + 5} />
      {row.periapses.map((p) => {
        const s = periapsisSpan(p.epoch, p.sigmaDays);
        const lo = Math.max(ax.left, ax.at(s.lo));
        const hi = Math.min(ax.right, ax.at(s.hi));
        if (hi < ax.left || lo > ax.right) return null;
        const sigma =
          s.sigmaDays === null
            ? 'no covariance: uncertainty unknown'
            : `± ${s.sigmaDays.toFixed(1)} d (1σ)`;
        return (
          <g
            key={p.epoch}
            class={`periapsis-span${p.inSeason === false ? ' unseen' : ''}`}
            data-epoch={p.epoch}
            data-sigma-days={s.sigmaDays ?? ''}
          >
            <rect x={lo} y={y} width={Math.max(2, hi - lo)} height={10} rx="2" />
            {ax.at(s.t) >= ax.left && ax.at(s.t) <= ax.right && (
              <line class="periapsis-at" x1={ax.at(s.t)} x2={ax.at(s.t)} y1={y - 2} y2={y + 12} />
            )}
            <title>{`${row.name} periapsis ${utcText(p.epoch)} UTC ${sigma}${p.inSeason === false ? ', while it cannot be observed here' : ''}`}</title>
          </g>
        );
      })}
      <text class="periapsis-label" x={ax.right + 8} y={y + 9}>
        {periapsisText(row, year)}
      </text>
      {(['planned', 'proposed'] as const).flatMap((kind) =>
        (kind === 'planned' ? row.plannedDates : (row.proposedDates ?? []))
          .filter(inYear)
          .map((d) => (
            <rect
              key={`${kind}${d}`}
              class={`${kind}-mark`}
              data-date={d}
              x={centre(d) - 2.5}
              y={y + 1}
              width={5}
              height={8}
            >
              <title>{`${row.name}: ${kind} night ${d}`}</title>
            </rect>
          )),
      )}
    </g>
  );
}

/** The right-hand note of a track: the year's first periapsis with its σ, and how many more. */
export function periapsisText(row: Pick<SeasonRow, 'periapses'>, year: number): string {
  const inYear = row.periapses.filter((p) => p.epoch.startsWith(String(year)));
  const p = inYear[0];
  if (!p) return '';
  const s = p.sigmaDays === undefined ? ', σ unknown' : ` ± ${p.sigmaDays.toFixed(1)} d`;
  return `periapsis ${nightLabel(year, nightIndex(p.epoch, year))}${s}${inYear.length > 1 ? ` +${inYear.length - 1}` : ''}`;
}

function SeasonKey({ ax, y }: { ax: SeasonAxis; y: number }) {
  const sw = 40;
  return (
    <g class="season-key" transform={`translate(0 ${y})`}>
      <text class="key-title" x={ax.left - 8} y={11} text-anchor="end">
        cell: hours per night
      </text>
      {HOUR_EDGES.map((e, k) => (
        <g key={e}>
          <rect
            class="hours-cell"
            x={ax.left + k * sw}
            y={0}
            width={sw - 2}
            height={14}
            fill-opacity={hourOpacity(k)}
          />
          <text x={ax.left + k * sw} y={26}>
            {k === HOUR_EDGES.length - 1 ? `${e}+ h` : `${e}`}
          </text>
        </g>
      ))}
      <text class="key-note" x={ax.left + HOUR_EDGES.length * sw + 16} y={11}>
        blank: no usable hour · span: periapsis ± 1σ, line at its date · filled mark: night planned
        · hollow: proposed
      </text>
    </g>
  );
}

function NowCaret({
  ax,
  nowMs,
  top,
  bottom,
  zone,
}: {
  ax: SeasonAxis;
  nowMs: number;
  top: number;
  bottom: number;
  zone: string;
}) {
  const x = ax.at(nowMs);
  if (x < ax.left || x > ax.right) return null;
  return (
    <g class="now-mark" data-ms={nowMs}>
      <path d={`M${x - 4},${top + 2}h8l-4,6z`} />
      <line x1={x} x2={x} y1={top + 8} y2={bottom} />
      <title>{`today, ${utcText(new Date(nowMs).toISOString())} UTC (${clockAt(nowMs, zone)} at the site)`}</title>
    </g>
  );
}
