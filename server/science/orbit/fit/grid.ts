/**
 * The global start: a search over P, e and the mean anomaly at a reference epoch (equivalently T)
 * in which, at each node, everything else is linear and solved by weighted least squares:
 * the Thiele–Innes constants (with the frame's offset and drift) from the astrometry, then the
 * systemic velocity and the signed distance from the radial velocities, whose sign settles
 * Ω against Ω + 180°. No starting guess of the orbit is needed, only the search ranges.
 */
import { AU_KM, SECONDS_PER_DAY, TWO_PI } from '../../constants.ts';
import { thieleInnesToCampbell } from '../elements.ts';
import { anomalyTable, readTable, TABLE_SIZE, type AnomalyTable } from './anomaly-table.ts';
import {
  astrometryColumns,
  type NodeFit,
  solveSmall,
  twoUnknowns,
  withFrame,
} from './grid-kernels.ts';
import { epochExtent, type Observation } from './measurements.ts';

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
  /** From velocities about the barycentre: the mass ratio q = M₂/M₁ to start from; null otherwise. */
  massRatio: number | null;
}

const E_NODES = [0, 0.15, 0.3, 0.45, 0.6, 0.7, 0.8, 0.87, 0.92, 0.95, 0.97];

/** Period nodes: the phase drifts by ≤ 0.03 cycle over the span between neighbours (≤ 20 % steps). */
function periodNodes(range: GridOptions['periodDays'], span: number): number[] {
  const periods: number[] = [];
  for (let P = range.min; P <= range.max * 1.0000001; P *= 1 + Math.min((0.03 * P) / span, 0.2))
    periods.push(P);
  if (periods.length === 0) periods.push(range.min);
  return periods;
}

/** The eccentricity nodes inside the range, or its middle when none falls inside. */
function eccentricityNodes(range: GridOptions['eccentricity']): number[] {
  const eNodes = E_NODES.filter((e) => e >= range.min - 1e-12 && e <= range.max + 1e-12);
  if (eNodes.length === 0) eNodes.push(0.5 * (range.min + range.max));
  return eNodes;
}

/**
 * Every node as (period row, eccentricity node, phase in cycles), phases finer at high e: from 24
 * to 600 per orbit, 4/(1 − e)^1.5.
 */
function enumerateNodes(
  periodCount: number,
  eNodes: number[],
): { count: number; row: Int32Array; ecc: Int32Array; phase: Float64Array } {
  const perE = eNodes.map((e) => Math.min(600, Math.max(24, Math.ceil(4 / (1 - e) ** 1.5))));
  const count = periodCount * perE.reduce((x, y) => x + y, 0);
  const row = new Int32Array(count),
    ecc = new Int32Array(count),
    phase = new Float64Array(count);
  let c = 0;
  for (let r = 0; r < periodCount; r++) {
    for (let k = 0; k < eNodes.length; k++) {
      for (let ph = 0; ph < perE[k]!; ph++, c++) {
        row[c] = r;
        ecc[c] = k;
        phase[c] = ph / perE[k]!;
      }
    }
  }
  return { count, row, ecc, phase };
}

/** Each epoch's table position at phase 0 of each period row, in table intervals, in [0, TABLE_SIZE). */
function phaseStarts(periods: readonly number[], jds: Float64Array, tRef: number): Float64Array[] {
  return periods.map((P) =>
    Float64Array.from(jds, (jd) => {
      const u = (jd - tRef) / P,
        x = (u - Math.floor(u)) * TABLE_SIZE;
      return x < TABLE_SIZE ? x : 0;
    }),
  );
}

/** A node from its linear solution: Thiele–Innes constants, then the frame terms that were fitted. */
function gridNode(
  fit: NodeFit,
  o: GridOptions,
  periodDays: number,
  periapsisJd: number,
  e: number,
): GridNode {
  const { chi2, sx, sy } = fit;
  const frame: [number, number, number, number] = [0, 0, 0, 0];
  let k = 2;
  if (o.frameOffset) {
    frame[0] = sx[k]!;
    frame[1] = sy[k]!;
    k++;
  }
  if (o.frameDrift) {
    frame[2] = sx[k]!;
    frame[3] = sy[k]!;
  }
  return {
    chi2: Math.max(chi2, 0),
    periodDays,
    periapsisJd,
    e,
    A: sy[0]!,
    F: sy[1]!,
    B: sx[0]!,
    G: sx[1]!,
    frame,
    gamma: null,
    signedDistancePc: null,
    massRatio: null,
  };
}

export function gridSearch(obs: Observation[], o: GridOptions): GridNode[] {
  const ast = astrometryColumns(obs);
  const rv = obs.filter((m) => m.kind === 'radial-velocity');
  const { first: t0, last: t1 } = epochExtent(obs.map((m) => m.jd));
  const span = Math.max(t1 - t0, 1e-3);
  const tRef = 0.5 * (t0 + t1);
  const nLin = 2 + (o.frameOffset ? 1 : 0) + (o.frameDrift ? 1 : 0);
  const periods = periodNodes(o.periodDays, span);
  const eNodes = eccentricityNodes(o.eccentricity);
  const nodes: GridNode[] = [];
  let cut = Infinity;
  const fit: NodeFit = { chi2: 0, sx: new Float64Array(nLin), sy: new Float64Array(nLin) };
  const kernel =
    nLin === 2
      ? twoUnknowns(ast)
      : withFrame(ast, nLin, o.frameOffset, o.frameDrift, o.frameEpochJd);
  const starts = phaseStarts(periods, ast.jd, tRef);
  const { count, row, ecc, phase } = enumerateNodes(periods.length, eNodes);
  const tables = eNodes.map((e) => anomalyTable(e));
  // Most promising first: each node's bound from its first eighth of the epochs (cheap), then the
  // nodes with the 4·POOL lowest bounds in order of bound, so the pool's cut is tight early, then the
  // rest, each skipped at once when its bound exceeds the cut. The order changes no result; a full
  // sort of every node would cost more than it saves. (No bounds with frame terms.)
  const bound = new Float64Array(count);
  if (kernel.bounds)
    for (let i = 0; i < count; i++) {
      kernel.fit(tables[ecc[i]!]!, starts[row[i]!]!, phase[i]! * TABLE_SIZE, -Infinity, fit);
      bound[i] = fit.chi2;
    }
  const tau = Float64Array.from(bound).sort()[Math.min(4 * POOL, count) - 1]!;
  const first: number[] = [];
  for (let i = 0; i < count; i++) if (bound[i]! <= tau) first.push(i);
  if (kernel.bounds) first.sort((x, y) => bound[x]! - bound[y]!); // without bounds: every node, in grid order
  const visit = (i: number) => {
    if (
      bound[i]! > cut ||
      !kernel.fit(tables[ecc[i]!]!, starts[row[i]!]!, phase[i]! * TABLE_SIZE, cut, fit)
    )
      return;
    const P = periods[row[i]!]!;
    nodes.push(gridNode(fit, o, P, tRef - phase[i]! * P, eNodes[ecc[i]!]!));
    // Prune often: a tight cut early lets more nodes stop early.
    if (nodes.length >= POOL + 100) cut = prune(nodes);
  };
  for (const i of first) visit(i);
  for (let i = 0; i < count; i++) if (!(bound[i]! <= tau)) visit(i);
  // The velocities join only for the nodes the astrometry likes best (they rarely reorder the rest).
  prune(nodes);
  if (rv.length > 0) for (const nd of nodes) velocityPart(nd, rv, anomalyTable(nd.e));
  return pickDistinct(nodes, o.keep);
}

/** The velocity coefficients of a node: one column per body whose velocities were measured. */
const COLUMN: Record<Observation['component'], number> = {
  relative: 1,
  secondary: 1,
  primary: 2,
  photocentre: 1, // positions only: never a velocity's column
};

/**
 * v = γ + c·b(t), b the radial velocity per parsec of the astrometric orbit: linear in γ and c, with
 * one c per body. For `relative` velocities c = D (the signed distance); about the barycentre the
 * secondary's c₂ = D/(1+q) and the primary's c₁ = −D·q/(1+q), so both give D = c₂ − c₁ and
 * q = −c₁/c₂; one of them alone starts from q = 1 (the distance and q are then told apart only by a
 * prior or a fixed value).
 */
function velocityPart(node: GridNode, rv: Observation[], table: AnomalyTable): void {
  const c = thieleInnesToCampbell(node);
  const e = node.e,
    sq = Math.sqrt(1 - e * e),
    n = TWO_PI / node.periodDays;
  const C = c.a * Math.sin(c.iRad) * Math.sin(c.argRad),
    H = c.a * Math.sin(c.iRad) * Math.cos(c.argRad);
  const hasPrimary = rv.some((m) => m.component === 'primary');
  const hasSecondary = rv.some((m) => m.component !== 'primary');
  // Unknowns: γ, then c for the secondary (or relative) velocities, then c for the primary's.
  const slot = [0, hasSecondary ? 1 : -1, hasPrimary ? (hasSecondary ? 2 : 1) : -1];
  const nu = 1 + (hasPrimary ? 1 : 0) + (hasSecondary ? 1 : 0);
  const N = new Float64Array(nu * nu),
    rhs = new Float64Array(nu),
    cs = new Float64Array(2),
    row = new Float64Array(nu);
  const basis = rv.map((m) => {
    // cs = (X, Y) = (cos E − e, √(1−e²)·sin E), so 1 − e·cos E = 1 − e² − e·X.
    readTable(table, (m.jd - node.periapsisJd) / node.periodDays, cs);
    const b = (KAPPA * n * ((-C * cs[1]!) / sq + H * sq * (cs[0]! + e))) / (1 - e * e - e * cs[0]!);
    const w = 1 / m.sigma[0] ** 2;
    row.fill(0);
    row[0] = 1;
    row[slot[COLUMN[m.component]]!] = b;
    for (let i = 0; i < nu; i++) {
      rhs[i] = rhs[i]! + w * row[i]! * m.value[0];
      for (let j = 0; j < nu; j++) N[i * nu + j] = N[i * nu + j]! + w * row[i]! * row[j]!;
    }
    return b;
  });
  if (!solveSmall(N, rhs, nu)) {
    // The velocities cannot separate γ from the distance (e.g. all on one night): start from their
    // mean and let the covariance step name what is undetermined.
    const w = rv.reduce((s, m) => s + m.sigma[0] ** -2, 0);
    node.gamma = rv.reduce((s, m) => s + m.value[0] * m.sigma[0] ** -2, 0) / w;
    return;
  }
  const c2 = hasSecondary ? rhs[1]! : null,
    c1 = hasPrimary ? rhs[nu - 1]! : null;
  node.gamma = rhs[0]!;
  if (!rv.some((m) => m.component !== 'relative')) node.signedDistancePc = c2;
  else {
    const q = c1 !== null && c2 !== null && -c1 / c2 > 0 ? -c1 / c2 : 1;
    node.massRatio = q;
    node.signedDistancePc =
      c2 !== null && c1 !== null ? c2 - c1 : c2 !== null ? c2 * (1 + q) : (-c1! * (1 + q)) / q;
  }
  rv.forEach((m, k) => {
    node.chi2 +=
      (m.value[0] - rhs[0]! - rhs[slot[COLUMN[m.component]]!]! * basis[k]!) ** 2 / m.sigma[0] ** 2;
  });
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
