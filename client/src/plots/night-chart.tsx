/**
 * One night as lanes along a single clock (the site's or UTC): darkness with the Sun's altitude
 * marks, the Moon's height and phase, then one lane per sky position whose fill is the target's
 * airmass class while every limit is met, left blank and named where a limit closes it, with the
 * night's blocks (and a proposal's) in the lane of their target, and a mark for now.
 * Geometry lives in night-lanes.ts and night-layout.ts; the text twin in night-text.ts.
 */
import type { BlockRow, Visibility } from '../api/client.ts';
import { DarknessLane, MoonLane, TimeAxis, NowMark, type ChartClock } from './night-frame.tsx';
import { chartSpan, nightLayout, type NightLayout } from './night-layout.ts';
import { AirmassKey, BlockTrack, ProposedTrack } from './night-blocks.tsx';
import { airmassBins, fillCeiling, laneModels, visTargetOf } from './night-lanes.ts';
import { TargetLane } from './night-lane.tsx';

export interface ProposedBlock {
  id: string;
  target: string;
  kind: string;
  start: { utc: string };
  end: { utc: string };
  pinned: boolean;
  laserGuideStar: boolean;
}
export interface NightChartProps {
  vis: Visibility;
  blocks: BlockRow[];
  targetName: (id: number) => string;
  nowMs?: number;
  clock: ChartClock;
  /** A proposed schedule, drawn in a track of its own in each lane. */
  proposed?: ProposedBlock[] | undefined;
  width?: number;
}

export function NightChart(props: NightChartProps) {
  const { vis } = props;
  const span = chartSpan(vis);
  const edges = airmassBins(fillCeiling(vis));
  const lanes = laneModels(vis, span, edges);
  const laneOf = (name: string) => {
    const t = visTargetOf(vis.targets, name);
    return lanes.findIndex((l) => t !== undefined && l.members.includes(t));
  };
  // Blocks of a target the night does not report on (not in its campaign) still get a lane.
  const strays = props.blocks.filter((b) => laneOf(props.targetName(b.targetId)) < 0);
  const strayProposed = props.proposed?.filter((b) => laneOf(b.target) < 0) ?? [];
  const extra = strays.length + strayProposed.length > 0 ? 1 : 0;
  const L = nightLayout(span, lanes.length + extra, !!props.proposed, props.width ?? 1100);
  const zone = props.clock === 'utc' ? 'UTC' : vis.site.timeZone;
  return (
    <svg
      class="plot night-chart"
      viewBox={`0 0 ${L.width} ${L.height}`}
      role="img"
      aria-label={`Night of ${vis.night.date} at ${vis.site.name}: darkness, Moon and ${lanes.length} target lane${lanes.length === 1 ? '' : 's'}; read as text below the chart`}
      aria-describedby="night-chart-text"
      data-span={`${span[0]} ${span[1]}`}
    >
      <TimeAxis L={L} span={span} zone={zone} siteZone={vis.site.timeZone} />
      <DarknessLane L={L} vis={vis} />
      <MoonLane L={L} vis={vis} span={span} />
      {lanes.map((lane, i) => (
        <TargetLane
          key={lane.members[0]!.name}
          L={L}
          box={L.lanes[i]!}
          index={i}
          lane={lane}
          vis={vis}
          edges={edges}
          blocks={props.blocks.filter((b) => laneOf(props.targetName(b.targetId)) === i)}
          targetName={props.targetName}
          proposed={props.proposed?.filter((b) => laneOf(b.target) === i)}
        />
      ))}
      {extra > 0 && (
        <StrayLane
          L={L}
          index={lanes.length}
          vis={vis}
          blocks={strays}
          proposed={strayProposed}
          targetName={props.targetName}
        />
      )}
      <AirmassKey L={L} edges={edges} />
      {props.nowMs !== undefined && (
        <NowMark L={L} span={span} nowMs={props.nowMs} siteZone={vis.site.timeZone} />
      )}
    </svg>
  );
}

/** A lane without fill for blocks of targets the night's report does not cover. */
function StrayLane(p: {
  L: NightLayout;
  index: number;
  vis: Visibility;
  blocks: BlockRow[];
  proposed: ProposedBlock[];
  targetName: (id: number) => string;
}) {
  const box = p.L.lanes[p.index]!;
  return (
    <g class="lane stray-lane" data-lane={p.index}>
      <text class="lane-name" x={p.L.left - 8} y={box.y + 12} text-anchor="end">
        other targets
      </text>
      <text class="lane-members" x={p.L.left - 8} y={box.y + 25} text-anchor="end">
        not in this night’s list
      </text>
      <BlockTrack
        L={p.L}
        y={box.blockY}
        h={box.blockH}
        vis={p.vis}
        blocks={p.blocks}
        targetName={p.targetName}
      />
      {box.proposedY !== null && (
        <ProposedTrack L={p.L} y={box.proposedY} vis={p.vis} blocks={p.proposed} />
      )}
    </g>
  );
}
