/**
 * One lane opened up: the target's altitude through the night on the chart's clock, above a
 * solid floor for the altitude it must clear, with the site's horizon mask at the target's
 * azimuth drawn as the ground it stands behind, and its windows filled.
 */
import type { Visibility, VisTarget } from '../api/client.ts';
import { ms } from '../lib/time.ts';
import { chartSpan, DETAIL_BOX, NIGHT_MARGIN } from './night-layout.ts';
import { runs } from './night-lanes.ts';
import { linear } from './scale.ts';
import { bothClocks, shortName } from './night-text.ts';
import { hourTicks, labelStep } from './time-axis.ts';

const TOP = DETAIL_BOX.top;
const PLOT_H = DETAIL_BOX.plotH;

/** Closed area paths under a sampled curve, only over the samples where `keep(k)` holds. */
export function areaPaths(
  t: readonly number[],
  v: readonly number[],
  keep: (k: number) => boolean,
  x: (ms: number) => number,
  y: (deg: number) => number,
): string[] {
  return runs(t.length, keep).map(([a, b]) => {
    const pts: string[] = [];
    for (let k = a; k <= b; k++) pts.push(`${x(t[k]!).toFixed(1)},${y(v[k]!).toFixed(1)}`);
    return `M${x(t[a]!).toFixed(1)},${y(0).toFixed(1)}L${pts.join('L')}L${x(t[b]!).toFixed(1)},${y(0).toFixed(1)}Z`;
  });
}

export function NightDetail(p: {
  vis: Visibility;
  target: VisTarget;
  zone: string;
  width?: number;
}) {
  const { vis, target } = p;
  const curve = target.curve;
  if (!curve) return null;
  const width = p.width ?? 1100;
  const span = chartSpan(vis);
  const x = linear(span, [NIGHT_MARGIN.left, width - NIGHT_MARGIN.right]);
  const y = linear([0, 90], [TOP + PLOT_H, TOP]);
  const t = curve.utc.map(ms);
  const alt = curve.altitudeDeg;
  const inSpan = (k: number) => t[k]! >= span[0] - 600_000 && t[k]! <= span[1] + 600_000;
  const limit = vis.limits.altitudeLimitDeg;
  const mask = curve.horizonMaskDeg;
  const zone = vis.site.timeZone;
  const line = altitudePath(t, alt, (k) => inSpan(k) && alt[k]! >= 0, x, y);
  return (
    <svg
      class="plot night-detail"
      viewBox={`0 0 ${width} ${TOP + PLOT_H + 24}`}
      role="img"
      aria-label={`altitude of ${shortName(target)} through the night, with the ${limit.toFixed(1)}° lowest altitude and the horizon mask`}
    >
      <defs>
        <clipPath id="detail-area">
          <rect x={x(span[0])} y={TOP} width={x(span[1]) - x(span[0])} height={PLOT_H} />
        </clipPath>
      </defs>
      <AltitudeFloor x0={x(span[0])} x1={x(span[1])} y={y} limit={limit} />
      <HourGrid span={span} zone={p.zone} x={x} />
      <g clip-path="url(#detail-area)">
        <WindowColumns windows={target.windows} x={x} zone={zone} />
        {mask &&
          areaPaths(t, mask, (k) => inSpan(k) && mask[k]! > 0, x, y).map((d) => (
            <path key={d} class="mask-ground" d={d}>
              <title>{`the site’s horizon mask at ${shortName(target)}’s azimuth`}</title>
            </path>
          ))}
        <path class="altitude-line" d={line} />
      </g>
      <AltitudeAxis x0={x(span[0])} y={y} name={shortName(target)} />
    </svg>
  );
}

/** The altitude line over its runs above the horizon, one subpath per run. */
function altitudePath(
  t: number[],
  alt: number[],
  shown: (k: number) => boolean,
  x: (v: number) => number,
  y: (v: number) => number,
): string {
  return runs(t.length, shown)
    .map(
      ([a, b]) =>
        `M${alt
          .slice(a, b + 1)
          .map((v, i) => `${x(t[a + i]!).toFixed(1)},${y(v).toFixed(1)}`)
          .join('L')}`,
    )
    .join('');
}

/** One full-height column per window, its edges in data attributes (ms). */
function WindowColumns(p: {
  windows: VisTarget['windows'];
  x: (v: number) => number;
  zone: string;
}) {
  const { x, zone } = p;
  return (
    <>
      {p.windows.map((w) => {
        const s = ms(w.start.utc);
        const e = ms(w.end.utc);
        return (
          <rect
            key={w.start.utc}
            class="window-column"
            data-start-ms={s}
            data-end-ms={e}
            x={x(s)}
            y={TOP}
            width={x(e) - x(s)}
            height={PLOT_H}
          >
            <title>{`window ${bothClocks(s, zone)} to ${bothClocks(e, zone)}`}</title>
          </rect>
        );
      })}
    </>
  );
}

/** The solid floor under the lowest altitude the target must clear, with its label. */
function AltitudeFloor(p: { x0: number; x1: number; y: (deg: number) => number; limit: number }) {
  const { x0, y, limit } = p;
  return (
    <>
      <rect class="below-limit" x={x0} y={y(limit)} width={p.x1 - x0} height={y(0) - y(limit)}>
        <title>{`below ${limit.toFixed(1)}°, the lowest altitude`}</title>
      </rect>
      <text class="floor-label" x={x0 + 6} y={y(limit) + 12}>
        {`lowest altitude ${limit.toFixed(1)}°`}
      </text>
    </>
  );
}

/** Hour lines across the plot, labelled as often as the width allows, on the chart's clock. */
function HourGrid(p: { span: [number, number]; zone: string; x: (ms: number) => number }) {
  const { span, x } = p;
  const pxPerHour = (x(span[1]) - x(span[0])) / ((span[1] - span[0]) / 3_600_000);
  const ticks = hourTicks(span[0], span[1], p.zone, labelStep(pxPerHour));
  return (
    <>
      {ticks.map((k) => (
        <g key={k.ms}>
          <line class="hour-grid" x1={x(k.ms)} x2={x(k.ms)} y1={TOP} y2={TOP + PLOT_H} />
          {k.labelled && (
            <text x={x(k.ms)} y={TOP + PLOT_H + 14} text-anchor="middle">{`${k.label}h`}</text>
          )}
        </g>
      ))}
    </>
  );
}

/** Altitude labels up the left edge and the lane's name beside them. */
function AltitudeAxis(p: { x0: number; y: (deg: number) => number; name: string }) {
  const { x0, y } = p;
  return (
    <>
      {[0, 30, 60, 90].map((v) => (
        <text key={v} class="alt-label" x={x0 - 6} y={y(v) + 4} text-anchor="end">{`${v}°`}</text>
      ))}
      <text class="lane-name" x={x0 - 34} y={TOP + 10} text-anchor="end">
        {p.name}
      </text>
      <text class="lane-members" x={x0 - 34} y={TOP + 23} text-anchor="end">
        altitude
      </text>
    </>
  );
}
