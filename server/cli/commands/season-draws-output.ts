/** `plan-season --draws`: the season Monte Carlo as percentile tables (or JSON, CSV). */
import type { SeasonDrawsView } from '../../store/index.ts';
import { formatTable, render, type Column, type OutputFormat } from '../output.ts';

type Target = SeasonDrawsView['draws']['targets'][number];
const FACTOR_WORDS: Record<Target['factors'][number]['name'], string> = {
  redshiftFactor: 'redshift factor',
  precessionFactor: 'precession factor',
};
type Dist = Target['periapsisSigmaDays'];

/** One row per target and quantity: its percentiles 5 … 95 with the median's sampling range. */
interface Row {
  target: string;
  quantity: string;
  unit: string;
  dist: NonNullable<Dist>;
  scale: number;
}

function rowsOf(view: SeasonDrawsView): Row[] {
  return view.draws.targets.flatMap((t) => {
    const rows: Row[] = [];
    const add = (quantity: string, unit: string, dist: Dist, scale = 1) => {
      if (dist) rows.push({ target: t.target, quantity, unit, dist, scale });
    };
    add(`σ of the ${t.passage?.date.slice(0, 10) ?? ''} periapsis date`, 'd', t.periapsisSigmaDays);
    add('σ of the mass', '%', t.massFraction, 100);
    for (const f of t.factors) add(`σ of the ${FACTOR_WORDS[f.name]}`, '', f.sigma);
    if (t.coverage)
      add(`coverage within ${t.coverage.withinDays} d`, '%', t.coverage.distribution, 100);
    return rows;
  });
}

const digits = (x: number) => (Math.abs(x) >= 100 ? 0 : Math.abs(x) >= 1 ? 2 : 3);
const at = (r: Row, k: number) => r.dist.percentiles[k]!.value * r.scale;

export function renderDraws(view: SeasonDrawsView, format: OutputFormat): string {
  const rows = rowsOf(view);
  const fmt = (x: number) => x.toFixed(digits(x));
  const columns: Column<Row>[] = [
    { header: 'target', value: (r) => r.target },
    { header: 'quantity', value: (r) => r.quantity },
    { header: 'unit', value: (r) => r.unit },
    ...[0, 1, 2, 3, 4].map((k) => ({
      header: `p${[5, 16, 50, 84, 95][k]}`,
      value: (r: Row) => (format === 'table' ? fmt(at(r, k)) : at(r, k)),
    })),
    {
      header: 'median_range',
      value: (r) =>
        `${fmt(r.dist.percentiles[2]!.low * r.scale)}–${fmt(r.dist.percentiles[2]!.high * r.scale)}`,
    },
  ];
  if (format !== 'table') return render(format, rows, columns, view);
  const d = view.draws;
  const head = [
    `${d.draws} seasons drawn (seed ${d.seed}) of the ` +
      `${view.weather === 'aware' ? 'weather-aware' : 'weather-blind'} plan (${view.planned.epochs} ` +
      `epochs), each night lost at its site's learned chance:`,
    ...view.sites.map(
      (s) =>
        `  ${s.name}: a night is clear with chance ` +
        `${s.clearChance.mean === null ? '—' : `${(100 * s.clearChance.mean).toFixed(0)} %`} ` +
        `(from ${s.clearChance.nightsLogged} night reports and the prior)`,
    ),
    ...d.targets
      .filter((t) => t.windowCovered !== null)
      .map(
        (t) =>
          `  ${t.target}: at least one epoch survives in the passage's window in ` +
          `${(100 * t.windowCovered!).toFixed(1)} % of seasons; ${t.epochsLost.toFixed(1)} of ${t.epochs} ` +
          `epochs lost on average` +
          (t.kept.obtained + t.kept.planned > 0
            ? ` (${t.kept.obtained} already obtained, certain; ${t.kept.planned} kept as planned)`
            : ''),
      ),
    '',
  ];
  return (
    `${head.join('\n')}\n${formatTable(rows, columns)}\n${d.assumptions}; median_range: the ` +
    `median's sampling error (ranks N/2 ∓ √N).\n`
  );
}
