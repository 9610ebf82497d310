/** Shared timing helpers for the benchmarks: best of several runs, so a noisy neighbour hurts less. */
export function bestOf(runs: number, fn: () => void): number {
  let best = Infinity;
  for (let r = 0; r < runs; r++) {
    const t0 = process.hrtime.bigint();
    fn();
    best = Math.min(best, Number(process.hrtime.bigint() - t0) / 1e9);
  }
  return best;
}

/**
 * Best-of times (s) of a case and its baseline, run alternately so that a change in the machine's
 * load during the run hurts both alike.
 */
export function bestOfPair(
  runs: number,
  ours: () => void,
  baseline: () => void,
): { ours: number; baseline: number } {
  let a = Infinity;
  let b = Infinity;
  for (let r = 0; r < runs; r++) {
    a = Math.min(a, bestOf(1, ours));
    b = Math.min(b, bestOf(1, baseline));
  }
  return { ours: a, baseline: b };
}

/** A line in the format of docs/DESIGN.md: BENCH <name> <value> <unit> ratio=<x> vs <baseline>. */
export function benchLine(
  name: string,
  value: number,
  unit: string,
  ratio?: number,
  baseline?: string,
): string {
  const v = value >= 100 ? value.toFixed(0) : value >= 1 ? value.toFixed(2) : value.toPrecision(3);
  return ratio === undefined
    ? `BENCH ${name} ${v} ${unit}`
    : `BENCH ${name} ${v} ${unit} ratio=${ratio.toFixed(2)} vs ${baseline}`;
}

/** True when this module is the script that node/tsx was asked to run. */
export function isMain(url: string): boolean {
  return url === `file://${process.argv[1]}`;
}
