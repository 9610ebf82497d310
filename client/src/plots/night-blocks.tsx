/** The night chart's block tracks (stored and proposed) and its airmass key. */
import type { BlockRow, Visibility } from '../api/client.ts';
import { ms } from '../lib/time.ts';
import type { ProposedBlock } from './night-chart.tsx';
import type { NightLayout } from './night-layout.ts';
import { binOpacity } from './night-lanes.ts';
import { bothClocks } from './night-text.ts';

/** A label that fits a bar of `px` pixels at 10 px type, or none. */
function fitLabel(text: string, px: number): string {
  const chars = Math.floor((px - 6) / 5.6);
  if (chars >= text.length) return text;
  return chars >= 4 ? `${text.slice(0, chars - 1)}…` : '';
}

export function BlockTrack(p: {
  L: NightLayout;
  y: number;
  h: number;
  vis: Visibility;
  blocks: BlockRow[];
  targetName: (id: number) => string;
}) {
  const { x } = p.L;
  const zone = p.vis.site.timeZone;
  return (
    <g class="block-track">
      {p.blocks.map((b) => {
        const x0 = x(ms(b.startUtc));
        const w = Math.max(2, x(ms(b.endUtc)) - x0);
        const name = p.targetName(b.targetId);
        return (
          <g
            key={b.id}
            class={`block-bar ${b.status}${b.laserGuideStar ? ' lgs' : ''}`}
            data-block={b.id}
            data-start-ms={ms(b.startUtc)}
            data-end-ms={ms(b.endUtc)}
          >
            <rect x={x0} y={p.y} width={w} height={p.h} rx="2" />
            <text x={x0 + 3} y={p.y + 11.5}>
              {fitLabel(`${name} ${b.kind === 'astrometry' ? 'astrometry' : 'spectra'}`, w)}
            </text>
            <title>{`${name}, ${b.kind}, ${bothClocks(ms(b.startUtc), zone)} to ${bothClocks(ms(b.endUtc), zone)}, ${b.status}${b.laserGuideStar ? ', laser guide star' : ''}`}</title>
          </g>
        );
      })}
    </g>
  );
}

export function ProposedTrack(p: {
  L: NightLayout;
  y: number;
  vis: Visibility;
  blocks: ProposedBlock[];
}) {
  const { x } = p.L;
  const zone = p.vis.site.timeZone;
  return (
    <g class="block-track proposed-track">
      <text class="track-label" x={p.L.left - 8} y={p.y + 10} text-anchor="end">
        proposed
      </text>
      {p.blocks.map((b) => {
        const x0 = x(ms(b.start.utc));
        const w = Math.max(2, x(ms(b.end.utc)) - x0);
        return (
          <g
            key={b.id}
            class={`block-bar proposed${b.pinned ? ' pinned' : ''}${b.laserGuideStar ? ' lgs' : ''}`}
            data-proposed={b.id}
            data-start-ms={ms(b.start.utc)}
            data-end-ms={ms(b.end.utc)}
          >
            <rect x={x0} y={p.y} width={w} height={12} rx="2" />
            <text x={x0 + 3} y={p.y + 9.5}>
              {fitLabel(`${b.pinned ? 'pinned ' : ''}${b.target}`, w)}
            </text>
            <title>{`proposed: ${b.target}, ${b.kind}, ${bothClocks(ms(b.start.utc), zone)} to ${bothClocks(ms(b.end.utc), zone)}${b.pinned ? ', pinned' : ''}${b.laserGuideStar ? ', laser guide star' : ''}`}</title>
          </g>
        );
      })}
    </g>
  );
}

/** The fill's scale: one swatch per airmass class, with its edges written under it. */
export function AirmassKey({ L, edges }: { L: NightLayout; edges: number[] }) {
  const sw = 46;
  const x0 = L.left;
  const n = edges.length - 1;
  return (
    <g class="airmass-key" transform={`translate(0 ${L.keyY})`}>
      <text class="key-title" x={x0 - 8} y={11} text-anchor="end">
        lane fill: airmass
      </text>
      {edges.slice(0, -1).map((e, k) => (
        <g key={e}>
          <rect
            class="fill-cell"
            x={x0 + k * sw}
            y={0}
            width={sw - 2}
            height={14}
            fill-opacity={binOpacity(k, n)}
          />
          <text x={x0 + k * sw} y={26}>
            {e.toFixed(2).replace(/0$/, '')}
          </text>
        </g>
      ))}
      <text x={x0 + n * sw - 4} y={26}>
        {edges[n]!.toFixed(2).replace(/0$/, '')}
      </text>
      <text class="key-note" x={x0 + n * sw + 30} y={11}>
        stronger colour is lower airmass (Kasten &amp; Young) · blank: closed, the limit named in
        the gap and on hover
      </text>
    </g>
  );
}
