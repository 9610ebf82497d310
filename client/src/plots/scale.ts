/** Linear scales and round-number ticks for the SVG plots (pure; unit-tested in node). */

export interface Scale {
  (v: number): number;
  invert(px: number): number;
  domain: [number, number];
  range: [number, number];
}

/** Map [d0, d1] onto [r0, r1]; a reversed range flips the axis (east-left, north-up). */
export function linear(domain: [number, number], range: [number, number]): Scale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const k = d1 === d0 ? 0 : (r1 - r0) / (d1 - d0);
  const f = ((v: number) => r0 + (v - d0) * k) as Scale;
  f.invert = (px: number) => (k === 0 ? d0 : d0 + (px - r0) / k);
  f.domain = domain;
  f.range = range;
  return f;
}

/** A step of 1, 2 or 5 × 10^n giving about `count` intervals over [lo, hi]. */
export function niceStep(lo: number, hi: number, count = 5): number {
  const span = Math.abs(hi - lo) || 1;
  const raw = span / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const f = raw / mag;
  return (f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10) * mag;
}

/** Ticks at multiples of the nice step that fall inside [lo, hi] (either order). */
export function ticks(lo: number, hi: number, count = 5): number[] {
  const a = Math.min(lo, hi);
  const b = Math.max(lo, hi);
  const step = niceStep(a, b, count);
  // Integer multiples of the step, rounded to the step's decimals (no accumulated error).
  const decimals = Math.max(0, -Math.floor(Math.log10(step)));
  const out: number[] = [];
  for (let k = Math.ceil(a / step); k * step <= b; k++)
    out.push(Number((k * step).toFixed(decimals)) || 0);
  return out;
}

/** Widen [lo, hi] by a fraction on both sides (and give a zero-width span some room). */
export function pad(lo: number, hi: number, fraction = 0.08): [number, number] {
  const span = hi - lo || Math.abs(hi) || 1;
  return [lo - span * fraction, hi + span * fraction];
}

/** Label a tick without floating-point noise. */
export const tickLabel = (v: number) => String(Number(v.toPrecision(6)));
