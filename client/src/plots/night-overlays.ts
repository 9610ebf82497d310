/**
 * What the night chart lays over the targets' curves, as pure geometry (unit-tested in node):
 * the Moon's altitude above the horizon, and where a site's horizon mask, followed along a
 * target's path, rises above the altitude limit.
 */

type Map1 = (v: number) => number;

/** Runs of samples where `above(k)` holds, as [first, last] index pairs. */
export function runs(n: number, above: (k: number) => boolean): [number, number][] {
  const out: [number, number][] = [];
  let start = -1;
  for (let k = 0; k <= n; k++) {
    const on = k < n && above(k);
    if (on && start < 0) start = k;
    if (!on && start >= 0) out.push([start, k - 1]), (start = -1);
  }
  return out;
}

/** Where a sampled value crosses `level` between samples k and k+1, by linear interpolation (ms). */
function crossing(t: number[], v: number[], k: number, level: number): number {
  const f = (level - v[k]!) / (v[k + 1]! - v[k]!);
  return t[k]! + f * (t[k + 1]! - t[k]!);
}

/**
 * The Moon's altitude curve above the horizon only: one SVG path of "M…L…" pieces, each starting
 * and ending at the interpolated rise or set (0°) when it falls between samples.
 */
export function moonAbovePath(tMs: number[], altDeg: number[], x: Map1, y: Map1): string {
  const n = Math.min(tMs.length, altDeg.length);
  const pt = (t: number, a: number) => `${x(t).toFixed(1)},${y(a).toFixed(1)}`;
  return runs(n, (k) => altDeg[k]! >= 0)
    .map(([a, b]) => {
      const pts: string[] = [];
      if (a > 0) pts.push(pt(crossing(tMs, altDeg, a - 1, 0), 0));
      for (let k = a; k <= b; k++) pts.push(pt(tMs[k]!, altDeg[k]!));
      if (b < n - 1) pts.push(pt(crossing(tMs, altDeg, b, 0), 0));
      return `M${pts.join('L')}`;
    })
    .join('');
}

/**
 * Closed areas between the altitude limit and the horizon mask along a target's path, where the
 * mask is the higher of the two and the target is above the horizon (`targetAltDeg` > 0): there
 * the mask, not the limit, decides. An edge set by the target's rising or setting stops at the
 * last sample above the horizon; an edge set by the mask is interpolated to the limit.
 */
export function maskAboveLimitPaths(
  tMs: number[],
  maskDeg: number[],
  targetAltDeg: number[],
  limitDeg: number,
  x: Map1,
  y: Map1,
): string[] {
  const n = Math.min(tMs.length, maskDeg.length, targetAltDeg.length);
  const up = (k: number) => targetAltDeg[k]! > 0;
  const pt = (t: number, a: number) => `${x(t).toFixed(1)},${y(a).toFixed(1)}`;
  return runs(n, (k) => up(k) && maskDeg[k]! > limitDeg).map(([a, b]) => {
    const t0 = a > 0 && up(a - 1) ? crossing(tMs, maskDeg, a - 1, limitDeg) : tMs[a]!;
    const t1 = b < n - 1 && up(b + 1) ? crossing(tMs, maskDeg, b, limitDeg) : tMs[b]!;
    const top: string[] = [pt(t0, limitDeg)];
    for (let k = a; k <= b; k++) top.push(pt(tMs[k]!, maskDeg[k]!));
    top.push(pt(t1, limitDeg));
    return `M${top.join('L')}Z`;
  });
}
