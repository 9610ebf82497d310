/**
 * The grid's inner loops: at one (P, e, phase) node, the normal equations of the linear
 * Thiele–Innes (and frame) parameters summed over the astrometric epochs, solved, and the node's
 * χ². This is the whole grid's cost: for the benchmark's star (100 epochs, ~17 000 nodes) 1.7·10⁶
 * epoch passes with full sums, 0.33·10⁶ with the early rejection below and the grid's ordering.
 *
 * Early rejection. For any subset of the epochs, the least-squares χ² of the subset alone is a
 * lower bound on the full χ² at its own minimum (the full sum at the full optimum is at least the
 * subset's sum there, which is at least the subset's minimum). So the sums are checked after each
 * eighth of the epochs, taken in an order that spreads each prefix over the whole time span, and
 * a node whose bound already exceeds the pool's cut is dropped. The nodes kept are exactly those
 * the full sums would keep. The first bound also orders the grid's visits (grid.ts).
 */
import { JULIAN_YEAR_DAYS } from '../../constants.ts';
import { TABLE_SIZE as INTERVALS, type AnomalyTable } from './anomaly-table.ts';
import type { Observation } from './measurements.ts';

/**
 * A module-local copy: loaded as CommonJS (tsx does so for CommonJS callers), an imported binding
 * is a getter call per read.
 */
const TABLE_SIZE = INTERVALS;

/**
 * Astrometric components as (Δα*, Δδ) with their weights (separations converted: a start needs
 * no more), as columns in check order: jd, wx, wy, and wx·x, wy·y (the right-hand sides per unit
 * basis value); prefix sums of w·x² and the prefix lengths at which the bound is checked.
 */
export interface Astrometry {
  n: number;
  jd: Float64Array;
  wx: Float64Array;
  wy: Float64Array;
  px: Float64Array;
  py: Float64Array;
  /** Σ wx·x² + wy·y² over the first k epochs, k = 0 … n. */
  prefixSumWxx: Float64Array;
  /** Prefix lengths at which the bound is checked, ending with n. */
  stops: Int32Array;
}

/** Linear parameters and χ² of one node, filled by a kernel. */
export interface NodeFit {
  chi2: number;
  sx: Float64Array;
  sy: Float64Array;
}

/**
 * One node: the epochs' table positions are start[q] + offset (start in [0, TABLE_SIZE), offset
 * the node's phase in table intervals, in [0, TABLE_SIZE)). `fit` returns true and fills `out`
 * when the node's χ² is within cut; otherwise false, with out.chi2 a lower bound on the node's χ²
 * (+∞ when its linear parameters are undetermined). With cut = −∞ it returns at the first bound:
 * `bounds` says whether that bound is cheap (a prefix of the epochs) or the full χ².
 */
export interface NodeKernel {
  bounds: boolean;
  fit(table: AnomalyTable, start: Float64Array, offset: number, cut: number, out: NodeFit): boolean;
}

/** Epoch q of n in check order: strided, so every prefix spans the whole time range. */
function checkOrder(n: number): number[] {
  const stride = 8,
    order: number[] = [];
  for (let r = 0; r < stride; r++) for (let q = r; q < n; q += stride) order.push(q);
  return order;
}

export function astrometryColumns(obs: Observation[]): Astrometry {
  const sorted = obs
    // The start is searched on the relative positions; the photocentre's scale (β − B) comes after.
    .filter((o) => o.kind !== 'radial-velocity' && o.component === 'relative')
    .sort((a, b) => a.jd - b.jd)
    .map((o) => {
      if (o.kind === 'offsets')
        return {
          jd: o.jd,
          x: o.value[0],
          y: o.value[1],
          wx: 1 / o.sigma[0] ** 2,
          wy: 1 / o.sigma[1] ** 2,
        };
      const [rho, th] = o.value;
      const s = Math.max(o.sigma[0], rho * o.sigma[1]);
      return {
        jd: o.jd,
        x: rho * Math.sin(th),
        y: rho * Math.cos(th),
        wx: 1 / (s * s),
        wy: 1 / (s * s),
      };
    });
  const rows = checkOrder(sorted.length).map((q) => sorted[q]!);
  const col = (f: (r: (typeof rows)[number]) => number) => Float64Array.from(rows, f);
  const n = rows.length;
  const prefixSumWxx = new Float64Array(n + 1);
  rows.forEach((r, q) => {
    prefixSumWxx[q + 1] = prefixSumWxx[q]! + r.wx * r.x * r.x + r.wy * r.y * r.y;
  });
  // A prefix of fewer than 8 epochs rarely bounds anything; the last stop is the full sum.
  const stops = Int32Array.from(
    new Set(
      [1, 2, 3, 4, 5, 6, 7]
        .map((k) => Math.floor((k * n) / 8))
        .filter((k) => k >= 8)
        .concat(n),
    ),
  );
  return {
    n,
    jd: col((r) => r.jd),
    wx: col((r) => r.wx),
    wy: col((r) => r.wy),
    px: col((r) => r.wx * r.x),
    py: col((r) => r.wy * r.y),
    prefixSumWxx,
    stops,
  };
}

/**
 * The common case (no frame terms): Δα* = B·X + G·Y and Δδ = A·X + F·Y, two 2×2 systems sharing
 * X and Y. Sums in locals, the table read inlined, and χ² = Σw·x² − bᵀN⁻¹b by the 2×2 inverse.
 */
export function twoUnknowns(ast: Astrometry): NodeKernel {
  const { wx, wy, px, py, prefixSumWxx, stops } = ast;
  const fitNode: NodeKernel['fit'] = (table, start, offset, cut, fit) => {
    let bx0 = 0,
      bx1 = 0,
      by0 = 0,
      by1 = 0;
    let nx0 = 0,
      nx1 = 0,
      nx2 = 0,
      ny0 = 0,
      ny1 = 0,
      ny2 = 0;
    let q = 0,
      chi2 = Infinity,
      sx0 = 0,
      sx1 = 0,
      sy0 = 0,
      sy1 = 0;
    for (let s = 0; s < stops.length; s++) {
      const end = stops[s]!;
      for (; q < end; q++) {
        let x = start[q]! + offset;
        if (x >= TABLE_SIZE) x -= TABLE_SIZE;
        const i = x | 0,
          f = x - i,
          j = 4 * i;
        const X = table[j]! + f * table[j + 1]!,
          Y = table[j + 2]! + f * table[j + 3]!;
        const XX = X * X,
          XY = X * Y,
          YY = Y * Y,
          a = wx[q]!,
          b = wy[q]!,
          c = px[q]!,
          d = py[q]!;
        bx0 += c * X;
        bx1 += c * Y;
        by0 += d * X;
        by1 += d * Y;
        nx0 += a * XX;
        nx1 += a * XY;
        nx2 += a * YY;
        ny0 += b * XX;
        ny1 += b * XY;
        ny2 += b * YY;
      }
      const dx = nx0 * nx2 - nx1 * nx1,
        dy = ny0 * ny2 - ny1 * ny1;
      // Positive definite, with the same relative floor on the second pivot as solveSmall.
      const definite = nx0 > 0 && dx > 1e-12 * nx0 * nx2 && ny0 > 0 && dy > 1e-12 * ny0 * ny2;
      if (!definite) {
        if (end === ast.n) {
          fit.chi2 = Infinity;
          return false;
        }
        continue; // this prefix bounds nothing
      }
      sx0 = (nx2 * bx0 - nx1 * bx1) / dx;
      sx1 = (nx0 * bx1 - nx1 * bx0) / dx;
      sy0 = (ny2 * by0 - ny1 * by1) / dy;
      sy1 = (ny0 * by1 - ny1 * by0) / dy;
      chi2 = prefixSumWxx[end]! - (bx0 * sx0 + bx1 * sx1 + by0 * sy0 + by1 * sy1);
      // A prefix bound carries rounding of order 1e-16 of Σw·x²: lower it by far more than that.
      if (end < ast.n) chi2 -= 1e-9 * prefixSumWxx[end]!;
      if (chi2 > cut) {
        fit.chi2 = chi2;
        return false;
      }
    }
    fit.chi2 = chi2;
    fit.sx[0] = sx0;
    fit.sx[1] = sx1;
    fit.sy[0] = sy0;
    fit.sy[1] = sy1;
    return true;
  };
  return { bounds: stops.length > 1, fit: fitNode };
}

/** With a frame offset and/or drift: 3 or 4 unknowns per coordinate, solved by solveSmall (no early rejection). */
export function withFrame(
  ast: Astrometry,
  nLin: number,
  frameOffset: boolean,
  frameDrift: boolean,
  frameEpochJd: number,
): NodeKernel {
  const col = new Float64Array(nLin);
  const Nx = new Float64Array(nLin * nLin),
    Ny = new Float64Array(nLin * nLin);
  const bx = new Float64Array(nLin),
    by = new Float64Array(nLin);
  const fitNode: NodeKernel['fit'] = (table, start, offset, cut, fit) => {
    Nx.fill(0);
    Ny.fill(0);
    bx.fill(0);
    by.fill(0);
    for (let q = 0; q < ast.n; q++) {
      let x = start[q]! + offset;
      if (x >= TABLE_SIZE) x -= TABLE_SIZE;
      const i = x | 0,
        f = x - i,
        j = 4 * i;
      col[0] = table[j]! + f * table[j + 1]!;
      col[1] = table[j + 2]! + f * table[j + 3]!;
      let k = 2;
      if (frameOffset) col[k++] = 1;
      if (frameDrift) col[k] = (ast.jd[q]! - frameEpochJd) / JULIAN_YEAR_DAYS;
      const wx = ast.wx[q]!,
        wy = ast.wy[q]!,
        px = ast.px[q]!,
        py = ast.py[q]!;
      for (let a = 0; a < nLin; a++) {
        const ca = col[a]!;
        bx[a] = bx[a]! + px * ca;
        by[a] = by[a]! + py * ca;
        for (let b = 0; b <= a; b++) {
          Nx[a * nLin + b] = Nx[a * nLin + b]! + wx * ca * col[b]!;
          Ny[a * nLin + b] = Ny[a * nLin + b]! + wy * ca * col[b]!;
        }
      }
    }
    const { sx, sy } = fit;
    sx.set(bx);
    sy.set(by);
    fit.chi2 = Infinity;
    if (!solveSmall(Nx, sx, nLin) || !solveSmall(Ny, sy, nLin)) return false;
    let chi2 = ast.prefixSumWxx[ast.n]!;
    for (let a = 0; a < nLin; a++) chi2 -= bx[a]! * sx[a]! + by[a]! * sy[a]!;
    fit.chi2 = chi2;
    return chi2 <= cut;
  };
  return { bounds: false, fit: fitNode };
}

/**
 * Solve the small symmetric positive-definite system N·s = b in place (n ≤ 4 unknowns, N row-major).
 * The grid solves ~10⁴–10⁵ of these per fit; with ml-matrix each 2×2 solve cost ~7.5 µs in object
 * set-up (32 000 solves: 240 ms, as long as the grid's Kepler solves), so this one inner loop factors
 * by hand. Everything else (LM, covariance, sampler) uses ml-matrix.
 * @returns false when N is not positive definite (the linear parameters are not determined)
 */
export function solveSmall(N: Float64Array, b: Float64Array, n: number): boolean {
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
