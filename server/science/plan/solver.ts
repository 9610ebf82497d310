/**
 * Choosing blocks for one night: items that may each be placed once, at one of their allowed start
 * edges, without overlapping, with a changeover gap between consecutive blocks (longer when the
 * target changes), to maximise the summed value. Two solvers over the same problem:
 *
 * - `solveExact`: dynamic programming over (set of blocks used, last block, end edge). Exact for the
 *   grid, exponential in the number of items: for small nights and as the reference in tests.
 * - `solveGreedy`: value-ordered insertion at each block's best compatible start, then local
 *   improvement (move a block to its best free start; swap a placed block for an unplaced one of
 *   higher value, re-inserting the one taken out if it fits elsewhere). Deterministic: every tie
 *   is broken by item order, then by the earlier start.
 */

export interface SolverItem {
  /** Slots spanned: a block starting at edge i ends at edge i + slots. */
  slots: number;
  /** Changeover group (the target): consecutive blocks of one group need the shorter gap. */
  group: number;
  /** Allowed start edges, ascending. */
  starts: Int32Array;
  /** Value at each allowed start. */
  values: Float64Array;
}

export interface SolverProblem {
  edgeJd: Float64Array;
  items: SolverItem[];
  /** Gap needed between the end of a block of group a and the start of the next block of group b, days. */
  gapDays(a: number, b: number): number;
}

export interface Placement {
  item: number;
  start: number;
  end: number;
  value: number;
}

const EPS = 1e-9;

/** Largest number of items `solveExact` accepts (2^n states per end edge and block). */
export const EXACT_MAX_ITEMS = 12;

export function totalValue(ps: readonly Placement[]): number {
  return ps.reduce((s, p) => s + p.value, 0);
}

/** Exact optimum on the grid by dynamic programming. */
export function solveExact(p: SolverProblem): Placement[] {
  const items = p.items.map((it, idx) => ({ ...it, idx })).filter((it) => it.starts.length > 0);
  const n = items.length;
  if (n > EXACT_MAX_ITEMS) throw new RangeError(`solveExact: ${n} items exceed ${EXACT_MAX_ITEMS}`);
  const E = p.edgeJd.length;
  if (n === 0 || E === 0) return [];
  const size = 1 << n;
  // F[mask][last] = prefix-max over end edges of the best value of schedules using `mask` that
  // end with `last`; from[…] packs the previous state as prevLast * E + prevEnd (−1 for none),
  // startOf[…] the start index chosen.
  const F: (Float64Array | null)[] = new Array(size * n).fill(null);
  const from: (Int32Array | null)[] = new Array(size * n).fill(null);
  const startOf: (Int32Array | null)[] = new Array(size * n).fill(null);
  const argmax: (Int32Array | null)[] = new Array(size * n).fill(null);
  const slot = (mask: number, last: number) => mask * n + last;
  for (let mask = 0; mask < size; mask++) {
    // 1. Turn F[mask][last] into prefix maxima (with the end edge where the maximum is reached).
    for (let last = 0; last < n; last++) {
      const f = F[slot(mask, last)];
      if (f) argmax[slot(mask, last)] = prefixMaxima(f);
    }
    // 2. Extend every state of `mask` by each item b not in it, at each of b's starts.
    for (let b = 0; b < n; b++) {
      if (mask & (1 << b)) continue;
      const it = items[b]!;
      const key = slot(mask | (1 << b), b);
      for (let j = 0; j < it.starts.length; j++) {
        const s = it.starts[j]!;
        let base = mask === 0 ? 0 : -Infinity;
        let prev = -1;
        for (let last = 0; last < n && mask !== 0; last++) {
          const f = F[slot(mask, last)];
          if (!f) continue;
          const t = latestEdge(p.edgeJd, s, p.gapDays(items[last]!.group, it.group));
          if (t < 0 || f[t] === -Infinity) continue;
          if (f[t]! > base + EPS) {
            base = f[t]!;
            prev = last * E + argmax[slot(mask, last)]![t]!;
          }
        }
        if (base === -Infinity) continue;
        const e = s + it.slots;
        const v = base + it.values[j]!;
        let f = F[key];
        if (!f) {
          f = F[key] = new Float64Array(E).fill(-Infinity);
          from[key] = new Int32Array(E).fill(-1);
          startOf[key] = new Int32Array(E).fill(-1);
        }
        if (v > f[e]! + EPS) {
          f[e] = v;
          from[key]![e] = prev;
          startOf[key]![e] = j;
        }
      }
    }
  }
  // 3. The best final state; ties go to the first found (fewest blocks, lowest indices).
  let best = 0,
    bestMask = 0,
    bestLast = -1;
  for (let mask = 1; mask < size; mask++) {
    for (let last = 0; last < n; last++) {
      const f = F[slot(mask, last)];
      if (f && f[E - 1]! > best + EPS) {
        best = f[E - 1]!;
        bestMask = mask;
        bestLast = last;
      }
    }
  }
  // 4. Walk the back-pointers from the best final state.
  if (bestLast < 0) return [];
  return backtrack(items, { from, startOf, argmax }, n, E, bestMask, bestLast);
}

/** The last edge t with edgeJd[t] ≤ edgeJd[s] − gap, or −1 (binary search). */
function latestEdge(edgeJd: Float64Array, s: number, gap: number): number {
  const limit = edgeJd[s]! - gap + EPS;
  let lo = -1,
    hi = s; // edgeJd[lo] ≤ limit < edgeJd[hi]
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (edgeJd[mid]! <= limit) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** f becomes its running maximum over end edges; returns, per edge, where that maximum is reached. */
function prefixMaxima(f: Float64Array): Int32Array {
  const am = new Int32Array(f.length).fill(-1);
  let best = -Infinity,
    at = -1;
  for (let t = 0; t < f.length; t++) {
    if (f[t]! > best + EPS) {
      best = f[t]!;
      at = t;
    }
    f[t] = best;
    am[t] = at;
  }
  return am;
}

/** The placements of the best schedule, in order, read back through the DP's pointers. */
function backtrack(
  items: readonly (SolverItem & { idx: number })[],
  dp: {
    from: (Int32Array | null)[];
    startOf: (Int32Array | null)[];
    argmax: (Int32Array | null)[];
  },
  n: number,
  E: number,
  bestMask: number,
  bestLast: number,
): Placement[] {
  const { from, startOf, argmax } = dp;
  const slot = (mask: number, last: number) => mask * n + last;
  const out: Placement[] = [];
  let mask = bestMask,
    last = bestLast,
    end = argmax[slot(bestMask, bestLast)]![E - 1]!;
  while (last >= 0) {
    const key = slot(mask, last);
    const j = startOf[key]![end]!;
    const it = items[last]!;
    out.push({ item: it.idx, start: it.starts[j]!, end, value: it.values[j]! });
    const prev = from[key]![end]!;
    mask &= ~(1 << last);
    if (prev < 0) break;
    last = Math.floor(prev / E);
    end = prev % E;
  }
  return out.reverse();
}

/** The schedule as a start-ordered list, with the compatibility test the greedy solver needs. */
class Timeline {
  readonly list: Placement[] = [];
  constructor(private readonly p: SolverProblem) {}
  /** Index at which a block starting at edge s would be inserted. */
  private position(s: number): number {
    let lo = 0,
      hi = this.list.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (this.list[mid]!.start < s) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  }
  fits(item: number, s: number): boolean {
    const e = s + this.p.items[item]!.slots;
    const k = this.position(s);
    const prev = this.list[k - 1],
      next = this.list[k];
    const jd = this.p.edgeJd;
    if (
      prev &&
      jd[prev.end]! + this.p.gapDays(this.p.items[prev.item]!.group, this.p.items[item]!.group) >
        jd[s]! + EPS
    )
      return false;
    if (
      next &&
      jd[e]! + this.p.gapDays(this.p.items[item]!.group, this.p.items[next.item]!.group) >
        jd[next.start]! + EPS
    )
      return false;
    return true;
  }
  /** Best compatible start of an item, or null. */
  bestStart(item: number): { j: number; value: number } | null {
    const it = this.p.items[item]!;
    let best: { j: number; value: number } | null = null;
    for (let j = 0; j < it.starts.length; j++) {
      if ((!best || it.values[j]! > best.value + EPS) && this.fits(item, it.starts[j]!))
        best = { j, value: it.values[j]! };
    }
    return best;
  }
  insert(item: number, j: number): Placement {
    const it = this.p.items[item]!;
    const pl = { item, start: it.starts[j]!, end: it.starts[j]! + it.slots, value: it.values[j]! };
    this.list.splice(this.position(pl.start), 0, pl);
    return pl;
  }
  remove(pl: Placement): void {
    this.list.splice(this.list.indexOf(pl), 1);
  }
}

/**
 * Greedy insertion and local improvement from three orders (highest value; highest value per slot;
 * fewest allowed starts), keeping the best; at most `maxPasses` improvement passes each.
 */
export function solveGreedy(p: SolverProblem, maxPasses = 6): Placement[] {
  const peak = p.items.map((it) => it.values.reduce((m, v) => Math.max(m, v), 0));
  const base = p.items.map((_, i) => i).filter((i) => p.items[i]!.starts.length > 0);
  const keys: ((i: number) => number)[] = [
    (i) => -peak[i]!,
    (i) => -peak[i]! / p.items[i]!.slots,
    (i) => p.items[i]!.starts.length,
  ];
  let best: Placement[] = [];
  for (const key of keys) {
    const order = [...base].sort((a, b) => key(a) - key(b) || peak[b]! - peak[a]! || a - b);
    const got = improve(p, order, peak, maxPasses);
    if (totalValue(got) > totalValue(best) + EPS) best = got;
  }
  return best;
}

function improve(
  p: SolverProblem,
  order: number[],
  _peak: number[],
  maxPasses: number,
): Placement[] {
  const tl = new Timeline(p);
  const placed = new Map<number, Placement>();
  for (const i of order) {
    const b = tl.bestStart(i);
    if (b) placed.set(i, tl.insert(i, b.j));
  }
  for (let pass = 0; pass < maxPasses; pass++) {
    let improved = false;
    // Move each placed block to its best start given the others.
    for (const i of order) {
      const pl = placed.get(i);
      if (!pl) continue;
      tl.remove(pl);
      const b = tl.bestStart(i)!; // its old start is still free
      if (b.value > pl.value + EPS) improved = true;
      placed.set(i, b.value > pl.value + EPS ? tl.insert(i, b.j) : insertBack(tl, pl));
    }
    // Insert an unplaced block, taking out at most one placed block, when the total rises.
    for (const u of order) {
      if (placed.has(u)) continue;
      const direct = tl.bestStart(u);
      if (direct) {
        placed.set(u, tl.insert(u, direct.j));
        improved = true;
        continue;
      }
      let bestGain = EPS,
        bestMove: { out: Placement; uj: number; back: number | null } | null = null;
      for (const out of [...tl.list]) {
        tl.remove(out);
        const b = tl.bestStart(u);
        if (b) {
          const tmp = tl.insert(u, b.j);
          const back = tl.bestStart(out.item);
          tl.remove(tmp);
          const gain = b.value - out.value + (back ? back.value : 0);
          if (gain > bestGain) {
            bestGain = gain;
            bestMove = { out, uj: b.j, back: back ? back.j : null };
          }
        }
        insertBack(tl, out);
      }
      if (bestMove) {
        tl.remove(bestMove.out);
        placed.delete(bestMove.out.item);
        placed.set(u, tl.insert(u, bestMove.uj));
        if (bestMove.back !== null)
          placed.set(bestMove.out.item, tl.insert(bestMove.out.item, bestMove.back));
        improved = true;
      }
    }
    if (!improved) break;
  }
  return [...tl.list];
}

function insertBack(tl: Timeline, pl: Placement): Placement {
  let lo = 0,
    hi = tl.list.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (tl.list[mid]!.start < pl.start) lo = mid + 1;
    else hi = mid;
  }
  tl.list.splice(lo, 0, pl);
  return pl;
}
