/** Radial velocity against time: the predicted curve (with or without the relativistic terms) and measurements with 1σ bars. */
import { linear, pad, ticks, tickLabel } from './scale.ts';

export interface RvPoint {
  t: number;
  v: number;
}
export interface RvMeasurement extends RvPoint {
  id: number;
  sigma: number;
  residual?: number;
  /** Said before the value in the tooltip (e.g. "primary "). */
  label?: string;
}
export interface RvCurveProps {
  /** t in decimal years, v in km/s. */
  curve: RvPoint[];
  /** The other curve drawn faint for comparison (e.g. without relativity). */
  compare?: RvPoint[] | undefined;
  measurements: RvMeasurement[];
  nowYear?: number;
  width?: number;
}

const M = { left: 64, right: 14, top: 14, bottom: 40 };

export function RvCurvePlot(props: RvCurveProps) {
  const width = props.width ?? 560;
  const height = 260;
  const ts = [...props.curve, ...props.measurements].map((p) => p.t);
  const vs = [
    ...props.curve.map((p) => p.v),
    ...props.measurements.flatMap((m) => [m.v - m.sigma, m.v + m.sigma]),
  ];
  const x = linear([Math.min(...ts), Math.max(...ts)], [M.left, width - M.right]);
  const y = linear(pad(Math.min(...vs), Math.max(...vs)), [height - M.bottom, M.top]);
  const line = (pts: RvPoint[]) =>
    pts.map((p, i) => `${i ? 'L' : 'M'}${x(p.t).toFixed(1)},${y(p.v).toFixed(1)}`).join('');
  const xt = ticks(x.domain[0], x.domain[1], 6);
  const yt = ticks(y.domain[0], y.domain[1], 5);
  return (
    <svg
      class="plot rv-curve"
      viewBox={`0 0 ${width} ${height}`}
      role="img"
      aria-label="radial velocity against time"
    >
      <g class="grid">
        {yt.map((v) => (
          <line key={v} x1={M.left} x2={width - M.right} y1={y(v)} y2={y(v)} />
        ))}
      </g>
      <g class="axis x-axis">
        {xt.map((v) => (
          <text key={v} x={x(v)} y={height - M.bottom + 14} text-anchor="middle">
            {tickLabel(v)}
          </text>
        ))}
        <text
          class="axis-title"
          x={(M.left + width - M.right) / 2}
          y={height - 6}
          text-anchor="middle"
        >
          epoch (year, UTC)
        </text>
      </g>
      <g class="axis y-axis">
        {yt.map((v) => (
          <text key={v} x={M.left - 6} y={y(v) + 4} text-anchor="end">
            {tickLabel(v)}
          </text>
        ))}
        <text
          class="axis-title"
          transform={`translate(14 ${(M.top + height - M.bottom) / 2}) rotate(-90)`}
          text-anchor="middle"
        >
          v_r (km/s), receding +
        </text>
      </g>
      {props.nowYear !== undefined &&
        props.nowYear >= x.domain[0] &&
        props.nowYear <= x.domain[1] && (
          <line
            class="now-line"
            x1={x(props.nowYear)}
            x2={x(props.nowYear)}
            y1={M.top}
            y2={height - M.bottom}
          >
            <title>now</title>
          </line>
        )}
      {props.compare && <path class="rv-compare" d={line(props.compare)} />}
      <path class="rv-line" d={line(props.curve)} />
      {props.measurements.map((m) => (
        <g class="rv-measurement" key={m.id}>
          <line x1={x(m.t)} x2={x(m.t)} y1={y(m.v - m.sigma)} y2={y(m.v + m.sigma)} />
          <circle cx={x(m.t)} cy={y(m.v)} r="2.6" />
          <title>{`${tickLabel(m.t)}: ${m.label ?? ''}${m.v.toFixed(1)} ± ${m.sigma.toFixed(1)} km/s${m.residual === undefined ? '' : `, residual ${m.residual.toFixed(1)} km/s`}`}</title>
        </g>
      ))}
    </svg>
  );
}

/** Decimal year of an ISO instant (Julian years from J2000.0, good to the day for plotting). */
export const yearOf = (iso: string) =>
  2000 + (Date.parse(iso) - Date.parse('2000-01-01T12:00:00Z')) / (365.25 * 86_400_000);
