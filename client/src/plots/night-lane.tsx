/** One target lane of the night chart: its airmass fill, its named closures, its numbers and blocks. */
import type { BlockRow, Visibility } from '../api/client.ts';
import { BlockTrack, ProposedTrack } from './night-blocks.tsx';
import type { ProposedBlock } from './night-chart.tsx';
import type { LaneBox, NightLayout } from './night-layout.ts';
import { binOpacity, limitWords, type LaneModel, type Segment } from './night-lanes.ts';
import { bothClocks, laneTitle, shortName, systemOf } from './night-text.ts';

interface LaneProps {
  L: NightLayout;
  box: LaneBox;
  index: number;
  lane: LaneModel;
  vis: Visibility;
  edges: number[];
  blocks: BlockRow[];
  targetName: (id: number) => string;
  proposed: ProposedBlock[] | undefined;
}

export function TargetLane(p: LaneProps) {
  const { L, box, vis, lane } = p;
  const lead = lane.members[0]!;
  const names = lane.members.map(shortName);
  const system = systemOf(lead);
  const x = L.x;
  return (
    <g
      class="lane target-lane"
      data-lane={p.index}
      data-targets={lane.members.map((m) => m.name).join('|')}
    >
      <rect class="lane-ground" x={L.left} y={box.y} width={L.right - L.left} height={box.fillH} />
      {lane.segments.map((s) => (
        <SpanMark key={s.startMs} L={L} box={box} s={s} vis={vis} />
      ))}
      {lane.cells.map((c) => (
        <rect
          class="fill-cell"
          key={`f${c.startMs}`}
          data-bin={c.bin}
          x={x(c.startMs)}
          y={box.y + 1}
          width={x(c.endMs) - x(c.startMs)}
          height={box.fillH - 2}
          fill-opacity={binOpacity(c.bin, p.edges.length - 1)}
        >
          <title>{`airmass ${c.lo.toFixed(2)}${c.hi > c.lo + 0.005 ? `–${c.hi.toFixed(2)}` : ''}, ${bothClocks(c.startMs, vis.site.timeZone)} to ${bothClocks(c.endMs, vis.site.timeZone)}`}</title>
        </rect>
      ))}
      <g class="lane-label">
        <title>{laneTitle(lane.members)}</title>
        <text class="lane-name" x={L.left - 8} y={box.y + 12} text-anchor="end">
          {system ?? names[0]}
        </text>
        <text class="lane-members" x={L.left - 8} y={box.y + 25} text-anchor="end">
          {system ? names.join(', ') : ''}
        </text>
      </g>
      <text class="lane-numbers" x={L.right + 8} y={box.y + 12}>
        {`${lead.observableHours.toFixed(1)} h open${lane.bestAirmass !== null ? ` · best X ${lane.bestAirmass.toFixed(2)}` : ''}`}
      </text>
      <text class="lane-numbers muted" x={L.right + 8} y={box.y + 25}>
        {lane.moonLeastDeg === null
          ? 'Moon down in darkness'
          : `Moon ≥ ${lane.moonLeastDeg.toFixed(0)}° away`}
      </text>
      <BlockTrack
        L={L}
        y={box.blockY}
        h={box.blockH}
        vis={vis}
        blocks={p.blocks}
        targetName={p.targetName}
      />
      {box.proposedY !== null && (
        <ProposedTrack L={L} y={box.proposedY} vis={vis} blocks={p.proposed ?? []} />
      )}
    </g>
  );
}

/** An open stretch (a frame the fill sits in) or a closed one: blank, with its limit written and on hover. */
function SpanMark({
  L,
  box,
  s,
  vis,
}: {
  L: NightLayout;
  box: LaneBox;
  s: Segment;
  vis: Visibility;
}) {
  const { x } = L;
  const zone = vis.site.timeZone;
  const x0 = x(s.startMs);
  const w = x(s.endMs) - x0;
  const when = `${bothClocks(s.startMs, zone)} to ${bothClocks(s.endMs, zone)}`;
  if (s.limit === null)
    return (
      <rect
        class="open-span"
        data-start-ms={s.startMs}
        data-end-ms={s.endMs}
        x={x0}
        y={box.y}
        width={w}
        height={box.fillH}
      >
        <title>{`open ${when}`}</title>
      </rect>
    );
  const words = limitWords(vis)[s.limit];
  return (
    <g
      class={`closed-span limit-${s.limit}`}
      data-limit={s.limit}
      data-start-ms={s.startMs}
      data-end-ms={s.endMs}
    >
      <line x1={x0} x2={x0 + w} y1={box.y + box.fillH - 0.5} y2={box.y + box.fillH - 0.5} />
      {w > 44 && (
        <text x={x0 + w / 2} y={box.y + box.fillH / 2 + 3.5} text-anchor="middle">
          {words.short}
        </text>
      )}
      <rect class="hit" x={x0} y={box.y} width={w} height={box.fillH}>
        <title>{`closed ${when}: ${words.long}`}</title>
      </rect>
    </g>
  );
}
