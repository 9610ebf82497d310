/**
 * The global start: a search over P, e and the mean anomaly at a reference epoch (equivalently T)
 * in which, at each node, everything else is linear and solved by weighted least squares:
 * the Thiele–Innes constants (with the frame's offset and drift) from the astrometry, then the
 * systemic velocity and the signed distance from the radial velocities, whose sign settles
 * Ω against Ω + 180°. No starting guess of the orbit is needed, only the search ranges.
 */
import { AU_KM, JULIAN_YEAR_DAYS, SECONDS_PER_DAY, TWO_PI } from '../../constants.ts';
import { thieleInnesToCampbell } from '../elements.ts';
import { solveKeplerBatch } from '../kepler.ts';
import type { Observation } from './measurements.ts';

const KAPPA = AU_KM / SECONDS_PER_DAY / 1000;

export interface GridOptions {
  periodDays: { min: number; max: number };
  eccentricity: { min: number; max: number };
  frameOffset: boolean;
  frameDrift: boolean;
  frameEpochJd: number;
  /** How many distinct good nodes to return. */
  keep: number;
}

export interface GridNode {
  chi2: number;
  periodDays: number;
  periapsisJd: number;
  e: number;
  /** Thiele–Innes constants, mas. */
  A: number;
  B: number;
  F: number;
  G: number;
  /** Frame offset (mas) and drift (mas/yr), 0 when not fitted. */
  frame: [number, number, number, number];
  /** From the velocities: γ (km/s) and the signed distance (pc; negative means Ω + 180°); null without them. */
  gamma: number | null;
  signedDistancePc: number | null;
}

const E_NODES = [0, 0.15, 0.3, 0.45, 0.6, 0.7, 0.8, 0.87, 0.92, 0.95, 0.97];

/**
 * cos E and sin E tabulated over one orbit in mean anomaly, per eccentricity, and read by linear
 * interpolation: the grid needs ~10⁶ anomalies per fit and only start-level accuracy (≲0.01 rad at
 * e = 0.97 next to periapsis, far less elsewhere), so a table filled by the engine's Kepler solver
 * replaces a solve per epoch per node (about 20× faster).
 */
const TABLE_SIZE = 8192;
const tables = new Map<number, { cos: Float64Array; sin: Float64Array }>();
function anomalyTable(e: number): { cos: Float64Array; sin: Float64Array } {
  let t = tables.get(e);
  if (!t) {
    const M = Float64Array.from({ length: TABLE_SIZE + 1 }, (_, k) => (TWO_PI * k) / TABLE_SIZE);
    const E = solveKeplerBatch(M, e);
    t = { cos: E.map(Math.cos), sin: E.map(Math.sin) };
    if (tables.size > 64) tables.clear();
    tables.set(e, t);
  }
  return t;
}

/** cos E, sin E at orbital phase u (fraction of the period since periapsis, any real), written into out. */
function lookup(t: { cos: Float64Array; sin: Float64Array }, u: number, out: Float64Array): void {
  const x = (u - Math.floor(u)) * TABLE_SIZE;
  const i = Math.min(Math.floor(x), TABLE_SIZE - 1), f = x - i;
  out[0] = t.cos[i]! + f * (t.cos[i + 1]! - t.cos[i]!);
  out[1] = t.sin[i]! + f * (t.sin[i + 1]! - t.sin[i]!);
}

/**
 * Solve the small symmetric positive-definite system N·s = b in place (n ≤ 4 unknowns, N row-major).
 * The grid solves ~10⁴–10⁵ of these per fit; with ml-matrix each 2×2 solve cost ~7.5 µs in object
 * set-up (32 000 solves: 240 ms, as long as the grid's Kepler solves), so this one inner loop factors
 * by hand. Everything else (LM, covariance, sampler) uses ml-matrix.
 * @returns false when N is not positive definite (the linear parameters are not determined)
 */
function solveSmall(N: Float64Array, b: Float64Array, n: number): boolean {
  for (let j = 0; j < n; j++) {
    let d = N[j * n + j]!;
    for (let k = 0; k < j; k++) d -= N[j * n + k]! ** 2;
    if (!(d > 1e-12 * Math.abs(N[j * n + j]!)) || !(d > 0)) return false;
    const l = Math.sqrt(d);
    N[j * n + j] = l;
    for (let i = j + 1; i < n; i++) {
      let v = N[i * n + j]!;
      for (let k = 0; k < j; k++) v -= N[i * n + k]! * N[j * n + k]!;
      N[i * n + j] = v / l;
    }
  }
  for (let i = 0; i < n; i++) {
    let v = b[i]!;
    for (let k = 0; k < i; k++) v -= N[i * n + k]! * b[k]!;
    b[i] = v / N[i * n + i]!;
  }
  for (let i = n - 1; i >= 0; i--) {
    let v = b[i]!;
    for (let k = i + 1; k < n; k++) v -= N[k * n + i]! * b[k]!;
    b[i] = v / N[i * n + i]!;
  }
  return true;
}

/** Astrometric components as (Δα*, Δδ) with σ, separations converted (a start needs no more). */
function cartesian(obs: Observation[]): { jd: number; x: number; y: number; wx: number; wy: number }[] {
  return obs.filter((o) => o.kind !== 'radial-velocity').map((o) => {
    if (o.kind === 'offsets') return { jd: o.jd, x: o.value[0], y: o.value[1], wx: 1 / o.sigma[0] ** 2, wy: 1 / o.sigma[1] ** 2 };
    const [rho, th] = o.value;
    const s = Math.max(o.sigma[0], rho * o.sigma[1]);
    return { jd: o.jd, x: rho * Math.sin(th), y: rho * Math.cos(th), wx: 1 / (s * s), wy: 1 / (s * s) };
  });
}

export function gridSearch(obs: Observation[], o: GridOptions): GridNode[] {
  const ast = cartesian(obs);
  const rv = obs.filter((m) => m.kind === 'radial-velocity');
  const all = obs.map((m) => m.jd);
  const t0 = Math.min(...all), t1 = Math.max(...all);
  const span = Math.max(t1 - t0, 1e-3);
  const tRef = 0.5 * (t0 + t1);
  const nLin = 2 + (o.frameOffset ? 1 : 0) + (o.frameDrift ? 1 : 0);
  // Period nodes: the phase drifts by ≤ 0.03 cycle over the span between neighbours.
  const periods: number[] = [];
  for (let P = o.periodDays.min; P <= o.periodDays.max * 1.0000001; P *= 1 + Math.min(0.03 * P / span, 0.2)) periods.push(P);
  if (periods.length === 0) periods.push(o.periodDays.min);
  const eNodes = E_NODES.filter((e) => e >= o.eccentricity.min - 1e-12 && e <= o.eccentricity.max + 1e-12);
  if (eNodes.length === 0) eNodes.push(0.5 * (o.eccentricity.min + o.eccentricity.max));
  const nodes: GridNode[] = [];
  let cut = Infinity;
  const col = new Float64Array(nLin);
  const Nx = new Float64Array(nLin * nLin), Ny = new Float64Array(nLin * nLin);
  const bx = new Float64Array(nLin), by = new Float64Array(nLin);
  const sx = new Float64Array(nLin), sy = new Float64Array(nLin);
  // χ² = Σw·x² − bᵀs at the least-squares solution s: no second pass over the epochs.
  const sumWxx = ast.reduce((a, m) => a + m.wx * m.x * m.x, 0), sumWyy = ast.reduce((a, m) => a + m.wy * m.y * m.y, 0);
  const u0 = new Float64Array(ast.length);
  const TS = TABLE_SIZE;
  for (const P of periods) {
    ast.forEach((m, q) => (u0[q] = (m.jd - tRef) / P));
    for (const e of eNodes) {
      const sq = Math.sqrt(1 - e * e);
      const { cos, sin } = anomalyTable(e);
      const nPhase = Math.min(600, Math.max(24, Math.ceil(4 / (1 - e) ** 1.5)));
      for (let ph = 0; ph < nPhase; ph++) {
        const T = tRef - (ph / nPhase) * P;
        Nx.fill(0); Ny.fill(0); bx.fill(0); by.fill(0);
        for (let q = 0; q < ast.length; q++) {
          const m = ast[q]!;
          // Inline table read (see lookup): cos E, sin E at this phase.
          const u = u0[q]! + ph / nPhase;
          const xTab = (u - Math.floor(u)) * TS;
          const i = Math.min(xTab | 0, TS - 1), f = xTab - i;
          const X = cos[i]! + f * (cos[i + 1]! - cos[i]!) - e, Y = sq * (sin[i]! + f * (sin[i + 1]! - sin[i]!));
          if (nLin === 2) {
            // The common case (no frame terms), unrolled.
            const wx = m.wx, wy = m.wy;
            bx[0] = bx[0]! + wx * X * m.x; bx[1] = bx[1]! + wx * Y * m.x;
            by[0] = by[0]! + wy * X * m.y; by[1] = by[1]! + wy * Y * m.y;
            Nx[0] = Nx[0]! + wx * X * X; Nx[2] = Nx[2]! + wx * Y * X; Nx[3] = Nx[3]! + wx * Y * Y;
            Ny[0] = Ny[0]! + wy * X * X; Ny[2] = Ny[2]! + wy * Y * X; Ny[3] = Ny[3]! + wy * Y * Y;
            continue;
          }
          fillColumns(col, X, Y, m.jd, o);
          for (let a = 0; a < nLin; a++) {
            const ca = col[a]!;
            bx[a] = bx[a]! + m.wx * ca * m.x;
            by[a] = by[a]! + m.wy * ca * m.y;
            for (let b = 0; b <= a; b++) {
              Nx[a * nLin + b] = Nx[a * nLin + b]! + m.wx * ca * col[b]!;
              Ny[a * nLin + b] = Ny[a * nLin + b]! + m.wy * ca * col[b]!;
            }
          }
        }
        sx.set(bx);
        sy.set(by);
        if (!solveSmall(Nx, sx, nLin) || !solveSmall(Ny, sy, nLin)) continue;
        let chi2 = sumWxx + sumWyy;
        for (let a = 0; a < nLin; a++) chi2 -= bx[a]! * sx[a]! + by[a]! * sy[a]!;
        if (chi2 > cut) continue;
        const frame: [number, number, number, number] = [0, 0, 0, 0];
        let k = 2;
        if (o.frameOffset) { frame[0] = sx[k]!; frame[1] = sy[k]!; k++; }
        if (o.frameDrift) { frame[2] = sx[k]!; frame[3] = sy[k]!; }
        nodes.push({ chi2: Math.max(chi2, 0), periodDays: P, periapsisJd: T, e, A: sy[0]!, F: sy[1]!, B: sx[0]!, G: sx[1]!, frame, gamma: null, signedDistancePc: null });
        if (nodes.length >= 4 * POOL) cut = prune(nodes);
      }
    }
  }
  // The velocities join only for the nodes the astrometry likes best (they rarely reorder the rest).
  prune(nodes);
  if (rv.length > 0) for (const nd of nodes) velocityPart(nd, rv, anomalyTable(nd.e));
  return pickDistinct(nodes, o.keep);
}

function fillColumns(col: Float64Array, X: number, Y: number, jd: number, o: GridOptions): void {
  col[0] = X;
  col[1] = Y;
  let k = 2;
  if (o.frameOffset) col[k++] = 1;
  if (o.frameDrift) col[k] = (jd - o.frameEpochJd) / JULIAN_YEAR_DAYS;
}

/** v = γ + D·b(t), b the radial velocity per parsec of the astrometric orbit: linear in γ and D. */
function velocityPart(node: GridNode, rv: Observation[], table: { cos: Float64Array; sin: Float64Array }): void {
  const c = thieleInnesToCampbell(node);
  const e = node.e, sq = Math.sqrt(1 - e * e), n = TWO_PI / node.periodDays;
  const C = c.a * Math.sin(c.iRad) * Math.sin(c.argRad), H = c.a * Math.sin(c.iRad) * Math.cos(c.argRad);
  const N = new Float64Array(4), rhs = new Float64Array(2), cs = new Float64Array(2);
  const basis = rv.map((m) => {
    lookup(table, (m.jd - node.periapsisJd) / node.periodDays, cs);
    const b = (KAPPA * n * (-C * cs[1]! + H * sq * cs[0]!)) / (1 - e * cs[0]!);
    const w = 1 / m.sigma[0] ** 2;
    N[0] = N[0]! + w; N[2] = N[2]! + w * b; N[3] = N[3]! + w * b * b;
    rhs[0] = rhs[0]! + w * m.value[0]; rhs[1] = rhs[1]! + w * b * m.value[0];
    return b;
  });
  if (!solveSmall(N, rhs, 2)) {
    // The velocities cannot separate γ from the distance (e.g. all on one night): start from their
    // mean and let the covariance step name what is undetermined.
    const w = rv.reduce((s, m) => s + m.sigma[0] ** -2, 0);
    node.gamma = rv.reduce((s, m) => s + m.value[0] * m.sigma[0] ** -2, 0) / w;
    return;
  }
  node.gamma = rhs[0]!;
  node.signedDistancePc = rhs[1]!;
  rv.forEach((m, q) => (node.chi2 += (m.value[0] - rhs[0]! - rhs[1]! * basis[q]!) ** 2 / m.sigma[0] ** 2));
}

/** Nodes kept from the astrometric pass for the velocity pass. */
const POOL = 400;

/** Keep the POOL best nodes; returns the χ² above which a node cannot enter. */
function prune(nodes: GridNode[]): number {
  nodes.sort((a, b) => a.chi2 - b.chi2);
  nodes.length = Math.min(nodes.length, POOL);
  return nodes.length === POOL ? nodes[POOL - 1]!.chi2 : Infinity;
}

/** The best nodes that differ in period, eccentricity or phase. */
function pickDistinct(nodes: GridNode[], keep: number): GridNode[] {
  nodes.sort((a, b) => a.chi2 - b.chi2);
  const out: GridNode[] = [];
  for (const nd of nodes) {
    if (out.length >= keep) break;
    const near = out.some((q) => {
      const dp = Math.abs(Math.log(nd.periodDays / q.periodDays));
      const f = (nd.periapsisJd - q.periapsisJd) / q.periodDays;
      const dph = Math.abs(f - Math.round(f));
      return dp < 0.02 && Math.abs(nd.e - q.e) < 0.1 && dph < 0.05;
    });
    if (!near) out.push(nd);
  }
  return out;
}
