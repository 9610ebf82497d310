/**
 * One night on a UTC time axis: twilight bands, Moon-up strip, each target's altitude (or airmass)
 * curve, the altitude limit, a line for now, and the night's blocks in a lane beneath. In the
 * altitude view the Moon's own altitude is drawn too, and the site's horizon mask is shaded along
 * each target's path where it stands above the altitude limit.
 * Axis labels give UTC and the site's local clock side by side.
 */
import type { BlockRow, Visibility } from '../api/types.ts';
import { ms, utcClock, zoneClock } from '../lib/time.ts';
import { maskAboveLimitPaths, moonAbovePath } from './night-overlays.ts';
import { linear } from './scale.ts';

export type NightMode = 'altitude' | 'airmass';
export interface NightChartProps {
  vis: Visibility;
  blocks: BlockRow[];
  targetName: (id: number) => string;
  nowMs?: number;
  mode: NightMode;
  /** A proposed schedule, drawn in a second lane under the stored blocks. */
  proposed?:
    | {
        id: string;
        target: string;
        kind: string;
        start: { utc: string };
        end: { utc: string };
        pinned: boolean;
        laserGuideStar: boolean;
      }[]
    | undefined;
  width?: number;
}

/** Dash patterns so curves differ by more than colour. */
export const SERIES_DASH = ['', '6 3', '2 3', '8 3 2 3', '1 2', '10 4'];
/** The Moon's curve: long-short dashes, in its own colour and thinner than any target's. */
export const MOON_DASH = '12 3 3 3';
const M = { left: 54, right: 14, top: 14, bottom: 56 };
const LANE = 34;

/** Time axis from civil dusk minus an hour to civil dawn plus an hour (or the whole night span). */
export function nightSpan(vis: Visibility): [number, number] {
  const dusk = vis.sun.set?.utc ?? vis.night.start.utc;
  const dawn = vis.sun.rise?.utc ?? vis.night.end.utc;
  return [ms(dusk) - 1800_000, ms(dawn) + 1800_000];
}

export function NightChart(props: NightChartProps) {
  const { vis, mode } = props;
  const width = props.width ?? 1100;
  const plotH = 250;
  const lanes = props.proposed ? 2 : 1;
  const height = M.top + plotH + LANE * lanes + M.bottom;
  const [t0, t1] = nightSpan(vis);
  const x = linear([t0, t1], [M.left, width - M.right]);
  const y =
    mode === 'altitude'
      ? linear([0, 90], [M.top + plotH, M.top])
      : linear([3, 1], [M.top + plotH, M.top]);
  const value = (alt: number, am: number | null) =>
    mode === 'altitude' ? alt : am === null || am > 3 ? 3 : am;
  const tw = vis.sun.twilights;
  const band = (
    from: string | null | undefined,
    to: string | null | undefined,
    cls: string,
    label: string,
  ) =>
    from && to ? (
      <rect
        class={`band ${cls}`}
        x={x(ms(from))}
        width={Math.max(0, x(ms(to)) - x(ms(from)))}
        y={M.top}
        height={plotH}
      >
        <title>{label}</title>
      </rect>
    ) : null;
  const hours: number[] = [];
  for (let h = Math.ceil(t0 / 3600_000) * 3600_000; h <= t1; h += 3600_000) hours.push(h);
  const zone = vis.site.timeZone;
  const limit = mode === 'altitude' ? vis.limits.altitudeLimitDeg : vis.limits.highestAirmass;
  const laneY = M.top + plotH + 8;
  return (
    <svg
      class="plot night-chart"
      viewBox={`0 0 ${width} ${height}`}
      role="img"
      aria-label={`${mode} against time, ${vis.site.name}, night of ${vis.night.date}`}
    >
      <rect class="band day" x={M.left} y={M.top} width={width - M.left - M.right} height={plotH} />
      {band(
        vis.sun.set?.utc,
        vis.sun.rise?.utc,
        'civil',
        'civil twilight or darker (Sun below 0°)',
      )}
      {band(tw.civil.dusk?.utc, tw.civil.dawn?.utc, 'nautical', 'Sun below −6°')}
      {band(tw.nautical.dusk?.utc, tw.nautical.dawn?.utc, 'astro', 'Sun below −12°')}
      {vis.darkness.intervals.map((d) =>
        band(d.start.utc, d.end.utc, 'dark', `dark: ${vis.darkness.limit}`),
      )}
      {vis.moon.rise || vis.moon.set ? (
        <rect
          class="moon-up"
          x={x(Math.max(t0, vis.moon.rise ? ms(vis.moon.rise.utc) : t0))}
          y={M.top}
          height={6}
          width={Math.max(
            0,
            x(
              Math.min(
                t1,
                vis.moon.set && (!vis.moon.rise || ms(vis.moon.set.utc) > ms(vis.moon.rise.utc))
                  ? ms(vis.moon.set.utc)
                  : t1,
              ),
            ) - x(Math.max(t0, vis.moon.rise ? ms(vis.moon.rise.utc) : t0)),
          )}
        >
          <title>{`Moon up, ${Math.round(vis.moon.illuminatedFraction * 100)}% illuminated`}</title>
        </rect>
      ) : null}
      <g class="grid">
        {hours.map((h) => (
          <line key={h} x1={x(h)} x2={x(h)} y1={M.top} y2={M.top + plotH} />
        ))}
      </g>
      {limit !== undefined && (
        <line class="limit-line" x1={M.left} x2={width - M.right} y1={y(limit)} y2={y(limit)}>
          <title>
            {mode === 'altitude' ? `altitude limit ${limit.toFixed(1)}°` : `airmass limit ${limit}`}
          </title>
        </line>
      )}
      <pattern
        id="mask-hatch"
        patternUnits="userSpaceOnUse"
        width="6"
        height="6"
        patternTransform="rotate(45)"
      >
        <line x1="0" y1="0" x2="0" y2="6" />
      </pattern>
      <clipPath id="night-plot-area">
        <rect x={M.left} y={M.top} width={width - M.left - M.right} height={plotH} />
      </clipPath>
      {mode === 'altitude' &&
        vis.targets.map((t, i) =>
          t.curve?.horizonMaskDeg ? (
            <g
              class={`mask-band s${i % 6}`}
              key={`mask-${t.name}`}
              clip-path="url(#night-plot-area)"
            >
              {maskAboveLimitPaths(
                t.curve.utc.map(ms),
                t.curve.horizonMaskDeg,
                t.curve.altitudeDeg,
                vis.limits.altitudeLimitDeg,
                x,
                y,
              ).map((d) => (
                <path key={d} d={d} />
              ))}
              <title>{`horizon mask along ${t.name}’s path, above the ${vis.limits.altitudeLimitDeg.toFixed(0)}° limit`}</title>
            </g>
          ) : null,
        )}
      {mode === 'altitude' && vis.moon.curve ? (
        <g class="moon-curve" clip-path="url(#night-plot-area)">
          <path
            stroke-dasharray={MOON_DASH}
            d={moonAbovePath(vis.moon.curve.utc.map(ms), vis.moon.curve.altitudeDeg, x, y)}
          />
          <title>{`Moon altitude, ${Math.round(vis.moon.illuminatedFraction * 100)}% illuminated`}</title>
        </g>
      ) : null}
      {vis.targets.map((t, i) =>
        t.curve ? (
          <g class={`series s${i % 6}`} key={t.name} clip-path="url(#night-plot-area)">
            <path
              stroke-dasharray={SERIES_DASH[i % 6]}
              d={t.curve.utc
                .map(
                  (u, k) =>
                    `${k ? 'L' : 'M'}${x(ms(u)).toFixed(1)},${y(Math.max(mode === 'altitude' ? 0 : 1, value(t.curve!.altitudeDeg[k] ?? 0, t.curve!.airmass[k] ?? null))).toFixed(1)}`,
                )
                .join('')}
            />
            <title>{t.name}</title>
          </g>
        ) : null,
      )}
      <g class="axis y-axis">
        {(mode === 'altitude' ? [0, 15, 30, 45, 60, 75, 90] : [1, 1.5, 2, 2.5, 3]).map((v) => (
          <text key={v} x={M.left - 6} y={y(v) + 4} text-anchor="end">
            {v}
          </text>
        ))}
        <text
          class="axis-title"
          transform={`translate(13 ${M.top + plotH / 2}) rotate(-90)`}
          text-anchor="middle"
        >
          {mode === 'altitude' ? 'altitude (°)' : 'airmass (Kasten & Young)'}
        </text>
      </g>
      <g class="blocks-lane">
        {props.blocks.map((b) => (
          <g
            key={b.id}
            class={`block-bar ${b.status}${b.laserGuideStar ? ' lgs' : ''}`}
            data-block={b.id}
          >
            <rect
              x={x(ms(b.startUtc))}
              y={laneY}
              width={Math.max(2, x(ms(b.endUtc)) - x(ms(b.startUtc)))}
              height={LANE - 10}
              rx="3"
            />
            <text x={x(ms(b.startUtc)) + 3} y={laneY + 16}>
              {props.targetName(b.targetId).slice(0, 10)}
            </text>
            <title>{`${props.targetName(b.targetId)} ${b.kind} ${utcClock(b.startUtc)}–${utcClock(b.endUtc)} UTC (${b.status})${b.laserGuideStar ? ', laser guide star' : ''}`}</title>
          </g>
        ))}
        <text class="lane-label" x={M.left - 6} y={laneY + 16} text-anchor="end">
          stored
        </text>
      </g>
      {props.proposed && (
        <g class="blocks-lane proposed-lane">
          <text class="lane-label" x={M.left - 6} y={laneY + LANE + 16} text-anchor="end">
            proposed
          </text>
          {props.proposed.map((b) => (
            <g
              key={b.id}
              class={`block-bar proposed${b.pinned ? ' pinned' : ''}${b.laserGuideStar ? ' lgs' : ''}`}
              data-proposed={b.id}
            >
              <rect
                x={x(ms(b.start.utc))}
                y={laneY + LANE}
                width={Math.max(2, x(ms(b.end.utc)) - x(ms(b.start.utc)))}
                height={LANE - 10}
                rx="3"
              />
              <text x={x(ms(b.start.utc)) + 3} y={laneY + LANE + 16}>
                {b.pinned ? '⊙ ' : ''}
                {b.target.slice(0, 10)}
              </text>
              <title>{`proposed: ${b.target} ${b.kind} ${utcClock(b.start.utc)}–${utcClock(b.end.utc)} UTC${b.pinned ? ', pinned' : ''}`}</title>
            </g>
          ))}
        </g>
      )}
      <g class="axis x-axis">
        {hours.map((h) => {
          const iso = new Date(h).toISOString();
          return (
            <g key={h}>
              <text x={x(h)} y={height - M.bottom + 20} text-anchor="middle">
                {utcClock(iso)}
              </text>
              <text class="local" x={x(h)} y={height - M.bottom + 34} text-anchor="middle">
                {zoneClock(iso, zone)}
              </text>
            </g>
          );
        })}
        <text class="axis-title" x={M.left - 6} y={height - M.bottom + 20} text-anchor="end">
          UTC
        </text>
        <text class="axis-title local" x={M.left - 6} y={height - M.bottom + 34} text-anchor="end">
          local
        </text>
        <text
          class="axis-title"
          x={(M.left + width - M.right) / 2}
          y={height - 6}
          text-anchor="middle"
        >{`time (h:min), UTC and ${zone}`}</text>
      </g>
      {props.nowMs !== undefined && props.nowMs >= t0 && props.nowMs <= t1 && (
        <line
          class="now-line"
          x1={x(props.nowMs)}
          x2={x(props.nowMs)}
          y1={M.top}
          y2={laneY + LANE * lanes}
        >
          <title>now</title>
        </line>
      )}
    </svg>
  );
}
