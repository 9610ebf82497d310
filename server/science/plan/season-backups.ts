/**
 * Backups for the epochs a season cannot do without. A periapsis-window epoch whose site-night is
 * likely lost (its `nightWeights` entry, the chance the night is clear, at most 1 − `backupLossAbove`)
 * gets one more epoch of the same target and kind that would stand in for it: on another
 * site-night within `coverageWithinDays` + 1 day of it (the other site, or the next nights), the one
 * most likely clear (ties: the nearer in time, then the lower airmass), in time the plan leaves
 * free. A weather-blind plan (every weight 1) needs none.
 */
import { fits, take, type Planner } from './season-plan.ts';

/** A periapsis epoch on a night lost with at least this chance gets a backup; default 0.2. */
export const DEFAULT_BACKUP_LOSS_ABOVE = 0.2;

const pct = (x: number) => `${(100 * x).toFixed(0)} %`;

export function backupPass(p: Planner, lossAbove: number): void {
  const { nD, weight, dates } = p.nights;
  const critical = p.chosen.filter((c) => c.why === 'periapsis');
  for (const c of critical) {
    const loss = 1 - weight[c.o.s * nD + c.o.d]!;
    if (loss < lossAbove - 1e-12) continue;
    const reach = p.coverageWithinDays + 1;
    let best = null as (typeof p.states)[number]['options'][number] | null;
    let bestKey: [number, number, number] = [-1, 0, 0];
    for (const o of p.states[c.ti]!.options) {
      if (o.kind !== c.o.kind || (o.s === c.o.s && o.d === c.o.d)) continue;
      const dt = Math.abs(o.jd - c.o.jd);
      if (dt > reach || !fits(p, c.ti, o)) continue;
      const w = weight[o.s * nD + o.d]!;
      if (w <= 1 - loss + 1e-12) continue; // no better odds than the epoch it backs
      const key: [number, number, number] = [w, -dt, -o.airmass];
      if (
        key[0] > bestKey[0] + 1e-12 ||
        (Math.abs(key[0] - bestKey[0]) <= 1e-12 &&
          (key[1] > bestKey[1] + 1e-9 || (key[1] === bestKey[1] && key[2] > bestKey[2])))
      ) {
        best = o;
        bestKey = key;
      }
    }
    if (!best) continue;
    const site = p.sites[c.o.s]!.site.name,
      other = p.sites[best.s]!.site.name;
    const b = best;
    take(
      p,
      c.ti,
      b,
      'backup',
      (g) =>
        `backup for the periapsis epoch at ${site} ${dates[c.o.d]} (lost with chance ${pct(loss)}): ${other} ${dates[b.d]} is clear with chance ${pct(weight[b.s * nD + b.d]!)}; ${g.text}`,
    );
  }
}
