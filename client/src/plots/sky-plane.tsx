/**
 * The orbit on the sky, north up and east to the left (the astronomical convention), one mas the
 * same length on both axes. Track with date ticks, periapsis, measurements with 1σ error ellipses
 * and residual lines, and planned epochs.
 */
import {
  offsetsEllipse,
  separationToOffsets,
  svgRotationDeg,
  type ErrorEllipse,
} from './ellipse.ts';
import { linear, pad, ticks, tickLabel } from './scale.ts';

export interface SkyPoint {
  dRaMas: number;
  dDecMas: number;
}
export interface TrackPoint extends SkyPoint {
  epoch: string;
}
export interface SkyMeasurement extends SkyPoint {
  id: number;
  epoch: string;
  ellipse: ErrorEllipse;
  predicted?: SkyPoint;
}
export interface SkyPlaneProps {
  track: TrackPoint[];
  /** A second track for comparison (e.g. a fit not yet stored), drawn dashed. */
  compareTrack?: SkyPoint[] | undefined;
  /** Points on the track to label with their date (e.g. each 1 January). */
  dateTicks: TrackPoint[];
  periapsis?: TrackPoint | undefined;
  measurements: SkyMeasurement[];
  planned: TrackPoint[];
  width?: number;
  title?: string;
}

const M = { left: 58, right: 16, top: 22, bottom: 44 };

/** Plot geometry: square mas-per-pixel, east increasing to the left, north increasing upwards. */
export function skyPlaneGeometry(points: SkyPoint[], width: number, height: number) {
  const xs = points.map((p) => p.dRaMas).concat(0);
  const ys = points.map((p) => p.dDecMas).concat(0);
  let [x0, x1] = pad(Math.min(...xs), Math.max(...xs));
  let [y0, y1] = pad(Math.min(...ys), Math.max(...ys));
  const w = width - M.left - M.right;
  const h = height - M.top - M.bottom;
  const masPerPx = Math.max((x1 - x0) / w, (y1 - y0) / h);
  const cx = (x0 + x1) / 2;
  const cy = (y0 + y1) / 2;
  [x0, x1] = [cx - (masPerPx * w) / 2, cx + (masPerPx * w) / 2];
  [y0, y1] = [cy - (masPerPx * h) / 2, cy + (masPerPx * h) / 2];
  // East (positive Δα*) at the left edge; north (positive Δδ) at the top edge.
  const x = linear([x1, x0], [M.left, M.left + w]);
  const y = linear([y1, y0], [M.top, M.top + h]);
  return { x, y, masPerPx, w, h };
}

export function measurementPoint(m: {
  id: number;
  epoch: string;
  kind: string;
  dRaMas?: number | null;
  dDecMas?: number | null;
  sigmaDRaMas?: number | null;
  sigmaDDecMas?: number | null;
  correlation?: number | null;
  separationMas?: number | null;
  positionAngleDeg?: number | null;
  sigmaSeparationMas?: number | null;
  sigmaPositionAngleDeg?: number | null;
}): SkyMeasurement | null {
  if (m.kind === 'offsets' && m.dRaMas != null && m.dDecMas != null) {
    return {
      id: m.id,
      epoch: m.epoch,
      dRaMas: m.dRaMas,
      dDecMas: m.dDecMas,
      ellipse: offsetsEllipse(m.sigmaDRaMas ?? 0, m.sigmaDDecMas ?? 0, m.correlation ?? 0),
    };
  }
  if (m.kind === 'separation' && m.separationMas != null && m.positionAngleDeg != null) {
    const s = separationToOffsets(
      m.separationMas,
      m.positionAngleDeg,
      m.sigmaSeparationMas ?? 0,
      m.sigmaPositionAngleDeg ?? 0,
    );
    return { id: m.id, epoch: m.epoch, dRaMas: s.dRaMas, dDecMas: s.dDecMas, ellipse: s.ellipse };
  }
  return null;
}

/** Mark which points get a text label: each at least `minPx` from every labelled one before it. */
export function labelSpaced<T extends { px: number; py: number }>(
  points: T[],
  minPx: number,
): (T & { label: boolean })[] {
  const kept: T[] = [];
  return points.map((p) => {
    const label = kept.every((k) => Math.hypot(k.px - p.px, k.py - p.py) >= minPx);
    if (label) kept.push(p);
    return { ...p, label };
  });
}

export function SkyPlanePlot(props: SkyPlaneProps) {
  const width = props.width ?? 560;
  const height = Math.round(width * 0.92);
  const all: SkyPoint[] = [
    ...props.track,
    ...(props.compareTrack ?? []),
    ...props.measurements,
    ...props.planned,
  ];
  const { x, y, masPerPx } = skyPlaneGeometry(all, width, height);
  const path = props.track
    .map((p, i) => `${i ? 'L' : 'M'}${x(p.dRaMas).toFixed(1)},${y(p.dDecMas).toFixed(1)}`)
    .join('');
  return (
    <svg
      class="plot sky-plane"
      viewBox={`0 0 ${width} ${height}`}
      role="img"
      aria-label={props.title ?? 'orbit on the sky, north up, east left'}
      data-mas-per-px={masPerPx}
    >
      <SkyAxes x={x} y={y} width={width} height={height} />
      {props.compareTrack && (
        <path
          class="track-compare"
          d={props.compareTrack
            .map((p, i) => `${i ? 'L' : 'M'}${x(p.dRaMas).toFixed(1)},${y(p.dDecMas).toFixed(1)}`)
            .join('')}
        />
      )}
      <path class="track" d={path} />
      <g class="primary">
        <path d={`M${x(0) - 6},${y(0)}h12M${x(0)},${y(0) - 6}v12`} />
        <title>primary</title>
      </g>
      {labelSpaced(
        props.dateTicks.map((t) => ({ t, px: x(t.dRaMas), py: y(t.dDecMas) })),
        16,
      ).map(({ t, px, py, label }) => (
        <g class="date-tick" key={t.epoch}>
          <circle cx={px} cy={py} r="2.5" />
          {label && (
            <text x={px + 5} y={py - 5}>
              {t.epoch.slice(0, 4)}
            </text>
          )}
          <title>{t.epoch.slice(0, 10)}</title>
        </g>
      ))}
      {props.periapsis && (
        <g class="periapsis-mark">
          <path
            d={`M${x(props.periapsis.dRaMas)},${y(props.periapsis.dDecMas) - 7}l6,7l-6,7l-6,-7z`}
          />
          <text x={x(props.periapsis.dRaMas) + 9} y={y(props.periapsis.dDecMas) + 14}>
            periapsis {props.periapsis.epoch.slice(0, 10)}
          </text>
        </g>
      )}
      {props.measurements.map((m) => (
        <MeasurementMark key={m.id} m={m} x={x} y={y} masPerPx={masPerPx} />
      ))}
      {props.planned.map((p) => (
        <g class="planned" key={`p${p.epoch}`}>
          <rect x={x(p.dRaMas) - 4} y={y(p.dDecMas) - 4} width="8" height="8" />
          <title>{`planned ${p.epoch.slice(0, 16).replace('T', ' ')} UTC`}</title>
        </g>
      ))}
    </svg>
  );
}

type Scale = ReturnType<typeof linear>;

/** Grid lines, the two axes with their ticks and titles, and the N/E compass. */
function SkyAxes({ x, y, width, height }: { x: Scale; y: Scale; width: number; height: number }) {
  const xt = ticks(x.domain[1], x.domain[0], 6);
  const yt = ticks(y.domain[1], y.domain[0], 6);
  const bottom = height - M.bottom;
  const right = width - M.right;
  return (
    <>
      <g class="grid">
        {xt.map((v) => (
          <line key={`x${v}`} x1={x(v)} x2={x(v)} y1={M.top} y2={bottom} />
        ))}
        {yt.map((v) => (
          <line key={`y${v}`} y1={y(v)} y2={y(v)} x1={M.left} x2={right} />
        ))}
      </g>
      <g class="axis x-axis">
        {xt.map((v) => (
          <text key={v} x={x(v)} y={bottom + 14} text-anchor="middle" data-value={v}>
            {tickLabel(v)}
          </text>
        ))}
        <text class="axis-title" x={(M.left + right) / 2} y={height - 6} text-anchor="middle">
          Δα* (mas) — east ←
        </text>
      </g>
      <g class="axis y-axis">
        {yt.map((v) => (
          <text key={v} x={M.left - 6} y={y(v) + 4} text-anchor="end" data-value={v}>
            {tickLabel(v)}
          </text>
        ))}
        <text
          class="axis-title"
          transform={`translate(14 ${(M.top + bottom) / 2}) rotate(-90)`}
          text-anchor="middle"
        >
          Δδ (mas) — north ↑
        </text>
      </g>
      <g class="compass" transform={`translate(${right - 34} ${M.top + 34})`}>
        <line x1="0" y1="0" x2="0" y2="-24" />
        <text class="compass-n" x="0" y="-27" text-anchor="middle">
          N
        </text>
        <line x1="0" y1="0" x2="-24" y2="0" />
        <text class="compass-e" x="-28" y="4" text-anchor="end">
          E
        </text>
      </g>
    </>
  );
}

/** One measurement: its residual line to the prediction, its 1σ ellipse and its point. */
function MeasurementMark({
  m,
  x,
  y,
  masPerPx,
}: {
  m: SkyMeasurement;
  x: Scale;
  y: Scale;
  masPerPx: number;
}) {
  const e = m.ellipse;
  const words =
    `${m.epoch.slice(0, 10)}: Δα* ${m.dRaMas.toFixed(2)} mas, Δδ ${m.dDecMas.toFixed(2)} mas, ` +
    `1σ ellipse ${e.majorMas.toFixed(2)} × ${e.minorMas.toFixed(2)} mas at PA ${e.paDeg.toFixed(0)}°`;
  return (
    <g class="measurement" data-id={m.id}>
      {m.predicted && (
        <line
          class="residual"
          x1={x(m.predicted.dRaMas)}
          y1={y(m.predicted.dDecMas)}
          x2={x(m.dRaMas)}
          y2={y(m.dDecMas)}
        />
      )}
      <ellipse
        class="error-ellipse"
        cx={x(m.dRaMas)}
        cy={y(m.dDecMas)}
        rx={Math.max(m.ellipse.majorMas / masPerPx, 0.5)}
        ry={Math.max(m.ellipse.minorMas / masPerPx, 0.5)}
        transform={`rotate(${svgRotationDeg(m.ellipse.paDeg)} ${x(m.dRaMas)} ${y(m.dDecMas)})`}
        data-major-mas={m.ellipse.majorMas}
        data-minor-mas={m.ellipse.minorMas}
        data-pa-deg={m.ellipse.paDeg}
      />
      <circle class="measured" cx={x(m.dRaMas)} cy={y(m.dDecMas)} r="1.8" />
      <title>{words}</title>
    </g>
  );
}
