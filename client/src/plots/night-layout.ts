/**
 * Where the night chart's rows sit (pure; unit-tested in node): the clock on top, then the
 * darkness lane with the Sun's altitude marks under it, the Moon lane, one lane per sky position
 * (its airmass fill, its stored blocks, and a proposal's blocks when there is one), the key.
 */
import type { Visibility } from '../api/client.ts';
import { ms } from '../lib/time.ts';
import { linear, type Scale } from './scale.ts';

export interface LaneBox {
  /** Top of the lane, and of its fill strip. */
  y: number;
  fillH: number;
  blockY: number;
  blockH: number;
  /** The proposal's track, when a proposal is shown. */
  proposedY: number | null;
  bottom: number;
}

export interface NightLayout {
  width: number;
  height: number;
  left: number;
  right: number;
  x: Scale;
  axisY: number;
  dark: { y: number; h: number; notchY: number };
  moon: { y: number; h: number };
  lanes: LaneBox[];
  keyY: number;
}

export const NIGHT_MARGIN = { left: 188, right: 170 };
/** The detail's altitude plot: top edge and height in px, 0–90° upwards. */
export const DETAIL_BOX = { top: 14, plotH: 150 };
const FILL = 18;
const BLOCK = 16;
const PROPOSED = 14;
const GAP = 12;

/** The chart's time span: half an hour either side of sunset and sunrise (the whole night without them). */
export function chartSpan(vis: Pick<Visibility, 'sun' | 'night'>): [number, number] {
  const dusk = vis.sun.set?.utc ?? vis.night.start.utc;
  const dawn = vis.sun.rise?.utc ?? vis.night.end.utc;
  return [ms(dusk) - 1_800_000, ms(dawn) + 1_800_000];
}

export function nightLayout(
  span: [number, number],
  laneCount: number,
  withProposal: boolean,
  width = 1100,
): NightLayout {
  const left = NIGHT_MARGIN.left;
  const right = width - NIGHT_MARGIN.right;
  const axisY = 26;
  const dark = { y: 36, h: 20, notchY: 62 };
  const moon = { y: 88, h: 26 };
  let y = moon.y + moon.h + GAP + 4;
  const lanes: LaneBox[] = [];
  for (let i = 0; i < laneCount; i++) {
    const blockY = y + FILL + 2;
    const proposedY = withProposal ? blockY + BLOCK + 2 : null;
    const bottom = (proposedY ?? blockY) + (withProposal ? PROPOSED : BLOCK);
    lanes.push({ y, fillH: FILL, blockY, blockH: BLOCK, proposedY, bottom });
    y = bottom + GAP;
  }
  const keyY = y + 4;
  return {
    width,
    height: keyY + 34,
    left,
    right,
    x: linear(span, [left, right]),
    axisY,
    dark,
    moon,
    lanes,
    keyY,
  };
}

/**
 * Rows for labels at positions `xs` (px, in any order) so that two labels on one row stay at
 * least `minGap` apart: each label takes the first row whose last label is far enough left.
 */
export function labelRows(xs: readonly number[], minGap: number): number[] {
  const order = xs.map((x, i) => [x, i] as const).sort((a, b) => a[0] - b[0]);
  const lastOnRow: number[] = [];
  const rows = new Array<number>(xs.length).fill(0);
  for (const [x, i] of order) {
    let r = lastOnRow.findIndex((last) => x - last >= minGap);
    if (r < 0) r = lastOnRow.length;
    lastOnRow[r] = x;
    rows[i] = r;
  }
  return rows;
}
