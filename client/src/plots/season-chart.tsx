/**
 * A year at one site: for each target a strip whose bar heights are the observable hours of each
 * night, with periapsis dates (diamonds) and planned epochs (ticks) on the same date axis.
 * Heights carry the quantity, so the strip reads without colour.
 */
import { linear } from './scale.ts';

export interface SeasonRow {
  name: string;
  hoursPerNight: number[];
  periapsisDates: string[];
  plannedDates: string[];
  /** Nights of a proposed plan, not yet stored. */
  proposedDates?: string[];
  seasonText: string;
}
export interface SeasonChartProps {
  year: number;
  rows: SeasonRow[];
  /** Dark hours per night, drawn as the faint ceiling of every strip. */
  darkHours: number[];
  width?: number;
}

const M = { left: 150, right: 14, top: 10, bottom: 34 };
const ROW = 52;
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** Day index (0-based) of a YYYY-MM-DD date within its year. */
export function dayOfYear(date: string, year: number): number {
  return Math.round(
    (Date.parse(`${date.slice(0, 10)}T00:00:00Z`) - Date.UTC(year, 0, 1)) / 86_400_000,
  );
}

export function SeasonChart(props: SeasonChartProps) {
  const width = props.width ?? 860;
  const n = props.darkHours.length || 365;
  const height = M.top + props.rows.length * ROW + M.bottom;
  const x = linear([0, n], [M.left, width - M.right]);
  const bw = Math.max(1, (width - M.left - M.right) / n);
  const maxH = Math.max(1, ...props.darkHours);
  return (
    <svg
      class="plot season-chart"
      viewBox={`0 0 ${width} ${height}`}
      role="img"
      aria-label={`observable hours per night across ${props.year}`}
    >
      {MONTHS.map((m, i) => {
        const d = dayOfYear(`${props.year}-${String(i + 1).padStart(2, '0')}-01`, props.year);
        return (
          <g class="axis x-axis" key={m}>
            <line class="grid-line" x1={x(d)} x2={x(d)} y1={M.top} y2={height - M.bottom} />
            <text x={x(d) + 2} y={height - M.bottom + 14}>
              {m}
            </text>
          </g>
        );
      })}
      <text
        class="axis-title"
        x={(M.left + width) / 2}
        y={height - 4}
        text-anchor="middle"
      >{`night (local evening date, ${props.year}); bar height: observable hours, full strip = ${maxH.toFixed(1)} h`}</text>
      {props.rows.map((r, k) => {
        const top = M.top + k * ROW;
        const y = linear([0, maxH], [top + ROW - 8, top + 4]);
        return (
          <g class="season-row" key={r.name} data-target={r.name}>
            <text class="row-label" x={M.left - 6} y={top + ROW / 2} text-anchor="end">
              {r.name}
            </text>
            <text class="row-sub" x={M.left - 6} y={top + ROW / 2 + 13} text-anchor="end">
              {r.seasonText}
            </text>
            <path
              class="dark-ceiling"
              d={props.darkHours
                .map((h, i) => `${i ? 'L' : 'M'}${x(i).toFixed(1)},${y(h).toFixed(1)}`)
                .join('')}
            />
            <path
              class="hours-bars"
              d={r.hoursPerNight
                .map((h, i) =>
                  h > 0
                    ? `M${x(i).toFixed(1)},${y(0).toFixed(1)}v${(y(h) - y(0)).toFixed(1)}h${bw.toFixed(2)}v${(y(0) - y(h)).toFixed(1)}z`
                    : '',
                )
                .join('')}
            />
            {r.plannedDates.map((d) => (
              <line
                class="planned-tick"
                key={d}
                x1={x(dayOfYear(d, props.year)) + bw / 2}
                x2={x(dayOfYear(d, props.year)) + bw / 2}
                y1={top + ROW - 8}
                y2={top + ROW - 1}
              >
                <title>{`planned night ${d}`}</title>
              </line>
            ))}
            {(r.proposedDates ?? []).map((d) => (
              <circle
                class="proposed-mark"
                key={`p${d}`}
                cx={x(dayOfYear(d, props.year)) + bw / 2}
                cy={top + ROW - 4}
                r="3"
              >
                <title>{`proposed night ${d}`}</title>
              </circle>
            ))}
            {r.periapsisDates.map((d) => (
              <path
                class="periapsis-mark"
                key={d}
                d={`M${x(dayOfYear(d, props.year))},${top + 2}l5,6l-5,6l-5,-6z`}
              >
                <title>{`periapsis ${d}`}</title>
              </path>
            ))}
          </g>
        );
      })}
    </svg>
  );
}
