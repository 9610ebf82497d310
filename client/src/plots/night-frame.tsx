/**
 * The night chart's frame: one clock along the top (the site's zone or UTC, named with its
 * offset), the darkness lane with the Sun's altitude at each twilight, the Moon lane with its
 * height and phase, and the mark for now.
 */
import type { Visibility } from '../api/client.ts';
import { ms } from '../lib/time.ts';
import { labelRows, type NightLayout } from './night-layout.ts';
import { moonUpSpans } from './night-lanes.ts';
import { bothClocks } from './night-text.ts';
import { clockAt, hourTicks, labelStep, offsetLabel } from './time-axis.ts';

/** Which clock the chart's axis reads: the site's zone or UTC. */
export type ChartClock = 'site' | 'utc';

export function TimeAxis(p: {
  L: NightLayout;
  span: [number, number];
  zone: string;
  siteZone: string;
}) {
  const { L } = p;
  const pxPerHour = (L.right - L.left) / ((p.span[1] - p.span[0]) / 3_600_000);
  const ticks = hourTicks(p.span[0], p.span[1], p.zone, labelStep(pxPerHour));
  const bottom = L.lanes[L.lanes.length - 1]?.bottom ?? L.moon.y + L.moon.h;
  const first = offsetLabel(p.span[0], p.zone);
  const last = offsetLabel(p.span[1], p.zone);
  const clockName = p.zone === 'UTC' ? 'UTC' : `site clock, ${p.zone}`;
  return (
    <g class="time-axis" data-zone={p.zone}>
      <text class="clock-name" x={L.left - 8} y={L.axisY - 6} text-anchor="end">
        {clockName}
      </text>
      <text class="clock-offset" x={L.left - 8} y={L.axisY + 6} text-anchor="end">
        {first === last ? first : `${first} → ${last}`}
      </text>
      {ticks.map((t) => (
        <g key={t.ms} class={t.labelled ? 'hour labelled' : 'hour'}>
          <line class="hour-grid" x1={L.x(t.ms)} x2={L.x(t.ms)} y1={L.axisY + 4} y2={bottom} />
          {t.labelled && (
            <text x={L.x(t.ms)} y={L.axisY} text-anchor="middle" data-ms={t.ms}>
              {`${t.label}h`}
            </text>
          )}
        </g>
      ))}
      {p.zone !== p.siteZone && <title>{`UTC hours; the site’s clock is ${p.siteZone}`}</title>}
    </g>
  );
}

const SUN_MARKS = [
  ['set', 'rise', '0°', 'sunset', 'sunrise'],
  ['civil', 'civil', '−6°', 'civil dusk', 'civil dawn'],
  ['nautical', 'nautical', '−12°', 'nautical dusk', 'nautical dawn'],
  ['astronomical', 'astronomical', '−18°', 'astronomical dusk', 'astronomical dawn'],
] as const;

/** The Sun's altitude crossings of the night: sunset and the three twilights, each way. */
export function sunMarks(vis: Visibility): { ms: number; label: string; name: string }[] {
  const out: { ms: number; label: string; name: string }[] = [];
  for (const [dusk, dawn, label, duskName, dawnName] of SUN_MARKS) {
    const a = dusk === 'set' ? vis.sun.set : vis.sun.twilights[dusk].dusk;
    const b = dawn === 'rise' ? vis.sun.rise : vis.sun.twilights[dawn].dawn;
    if (a) out.push({ ms: ms(a.utc), label, name: duskName });
    if (b) out.push({ ms: ms(b.utc), label, name: dawnName });
  }
  return out;
}

export function DarknessLane({ L, vis }: { L: NightLayout; vis: Visibility }) {
  const { x } = L;
  const d = L.dark;
  const zone = vis.site.timeZone;
  const marks = sunMarks(vis);
  const rows = labelRows(
    marks.map((m) => x(m.ms)),
    30,
  );
  return (
    <g class="lane darkness-lane">
      <text class="lane-name" x={L.left - 8} y={d.y + 14} text-anchor="end">
        darkness
      </text>
      <text class="lane-numbers" x={L.right + 8} y={d.y + 14}>
        {`${vis.darkness.hours.toFixed(1)} h dark`}
      </text>
      <text class="lane-numbers muted" x={L.right + 8} y={d.y + 27}>
        {vis.darkness.limit}
      </text>
      {vis.darkness.intervals.map((i) => {
        const s = ms(i.start.utc);
        const e = ms(i.end.utc);
        return (
          <g key={i.start.utc} class="dark-span" data-start-ms={s} data-end-ms={e}>
            <rect x={x(s)} y={d.y} width={x(e) - x(s)} height={d.h} rx="3" />
            <text x={(x(s) + x(e)) / 2} y={d.y + 14} text-anchor="middle">
              {`${clockAt(s, zone)}–${clockAt(e, zone)} · ${i.hours.toFixed(1)} h`}
            </text>
            <title>{`dark (${vis.darkness.limit}) ${bothClocks(s, zone)} to ${bothClocks(e, zone)}`}</title>
          </g>
        );
      })}
      {marks.map((m, k) => (
        <g key={m.name} class="sun-notch" data-ms={m.ms}>
          <line x1={x(m.ms)} x2={x(m.ms)} y1={d.y + d.h + 1} y2={d.y + d.h + 5} />
          <text x={x(m.ms)} y={d.notchY + rows[k]! * 9} text-anchor="middle">
            {m.label}
          </text>
          <title>{`${m.name}, Sun at ${m.label}: ${bothClocks(m.ms, zone)}`}</title>
        </g>
      ))}
      <text class="notch-title" x={L.left - 8} y={d.notchY} text-anchor="end">
        Sun’s altitude
      </text>
    </g>
  );
}

export function MoonLane({
  L,
  vis,
  span,
}: {
  L: NightLayout;
  vis: Visibility;
  span: [number, number];
}) {
  const { x } = L;
  const m = L.moon;
  const zone = vis.site.timeZone;
  const curve = vis.moon.curve;
  const lit = Math.round(vis.moon.illuminatedFraction * 100);
  const t = curve?.utc.map(ms) ?? [];
  const alt = curve?.altitudeDeg ?? [];
  const yOf = (a: number) => m.y + m.h - (Math.max(0, a) / 90) * m.h;
  const spans = moonUpSpans(t, alt)
    .map(([s, e]) => [Math.max(s, span[0]), Math.min(e, span[1])] as [number, number])
    .filter(([s, e]) => e > s);
  const highest = alt.length
    ? Math.max(...alt.filter((_, i) => t[i]! >= span[0] && t[i]! <= span[1]))
    : null;
  return (
    <g class="lane moon-lane" data-lit={lit}>
      <text class="lane-name" x={L.left - 8} y={m.y + 12} text-anchor="end">
        Moon
      </text>
      <text class="lane-members" x={L.left - 8} y={m.y + 24} text-anchor="end">
        {`${lit}% lit`}
      </text>
      <line class="moon-horizon" x1={L.left} x2={L.right} y1={m.y + m.h} y2={m.y + m.h} />
      {spans.map(([s, e]) => {
        const inside = t.map((tt, i) => [tt, alt[i]!] as const).filter(([tt]) => tt > s && tt < e);
        const d = `M${x(s).toFixed(1)},${yOf(0)}${inside.map(([tt, a]) => `L${x(tt).toFixed(1)},${yOf(a).toFixed(1)}`).join('')}L${x(e).toFixed(1)},${yOf(0)}Z`;
        return (
          <g key={s} class="moon-up" data-start-ms={s} data-end-ms={e}>
            <path d={d} fill-opacity={0.25 + 0.6 * vis.moon.illuminatedFraction} />
            <title>{`Moon up ${bothClocks(s, zone)} to ${bothClocks(e, zone)}, ${lit}% lit; height 0–90° across the lane`}</title>
          </g>
        );
      })}
      <text class="lane-numbers" x={L.right + 8} y={m.y + 12}>
        {spans.length
          ? `up ${spans.reduce((h, [s, e]) => h + (e - s) / 3_600_000, 0).toFixed(1)} h`
          : 'down all night'}
      </text>
      <text class="lane-numbers muted" x={L.right + 8} y={m.y + 24}>
        {highest !== null && spans.length ? `highest ${highest.toFixed(0)}°` : ''}
      </text>
    </g>
  );
}

export function NowMark(p: {
  L: NightLayout;
  span: [number, number];
  nowMs: number;
  siteZone: string;
}) {
  if (p.nowMs < p.span[0] || p.nowMs > p.span[1]) return null;
  const { L } = p;
  const x = L.x(p.nowMs);
  const bottom = L.lanes[L.lanes.length - 1]?.bottom ?? L.moon.y + L.moon.h;
  return (
    <g class="now-mark" data-ms={p.nowMs}>
      <path d={`M${x - 5},${L.axisY + 2}h10l-5,7z`} />
      <line x1={x} x2={x} y1={L.axisY + 9} y2={bottom} />
      <title>{`now: ${bothClocks(p.nowMs, p.siteZone)}`}</title>
    </g>
  );
}
