/** How `epochwright fit` shows a fit: a summary, the parameters, each star's quantities, the residuals. */
import type { FitResult, Residual } from '../../science/orbit/fit/index.ts';
import { residualsCsv } from '../../store/index.ts';
import { formatCsv, formatTable, type Column } from '../output.ts';

interface QuantityRow {
  star: string;
  name: string;
  value: number;
  sigma: number;
  unit: string;
  fitted: string;
  p16?: number;
  p84?: number;
}

const digits = (v: number) => (Math.abs(v) >= 1e5 ? 3 : 6);

function quantityRows(r: FitResult): QuantityRow[] {
  const system = r.parameters
    .filter((p) => !p.name.includes('.'))
    .map((p) => ({
      star: '(system)',
      name: p.name,
      value: p.value,
      sigma: p.sigma,
      unit: p.unit,
      fitted: p.fixed ? 'fixed' : 'fitted',
      p16: p.percentiles?.[1],
      p84: p.percentiles?.[3],
    }));
  const stars = r.stars.flatMap((s) =>
    s.quantities.map((q) => ({
      star: s.name,
      name: q.name,
      value: q.value,
      sigma: q.sigma,
      unit: q.unit,
      fitted: q.fitted ? 'fitted' : 'derived',
      p16: q.percentiles?.[1],
      p84: q.percentiles?.[3],
    })),
  );
  return [...system, ...stars];
}

const QUANTITY_COLUMNS: Column<QuantityRow>[] = [
  { header: 'star', value: (q) => q.star },
  { header: 'quantity', value: (q) => q.name },
  { header: 'value', value: (q) => Number(q.value.toFixed(digits(q.value))) },
  { header: '1σ', value: (q) => Number(q.sigma.toPrecision(3)) },
  { header: 'unit', value: (q) => q.unit },
  { header: 'how', value: (q) => q.fitted },
];
const PERCENTILE_COLUMNS: Column<QuantityRow>[] = [
  {
    header: 'p16',
    value: (q) => (q.p16 === undefined ? null : Number(q.p16.toFixed(digits(q.p16)))),
  },
  {
    header: 'p84',
    value: (q) => (q.p84 === undefined ? null : Number(q.p84.toFixed(digits(q.p84)))),
  },
];

const RESIDUAL_COLUMNS: Column<Residual>[] = [
  { header: 'star', value: (x) => x.star },
  { header: 'row', value: (x) => x.id ?? String(x.index) },
  { header: 'kind', value: (x) => x.kind },
  { header: 'of', value: (x) => x.component },
  { header: 'epoch', value: (x) => x.epoch },
  { header: 'o−c 1', value: (x) => x.residual[0] ?? null, digits: 4 },
  { header: 'o−c 2', value: (x) => x.residual[1] ?? null, digits: 4 },
  { header: '(o−c)/σ 1', value: (x) => x.normalized[0] ?? null, digits: 2 },
  { header: '(o−c)/σ 2', value: (x) => x.normalized[1] ?? null, digits: 2 },
  { header: 'outlier', value: (x) => (x.outlier ? 'yes' : '') },
];

export function summary(r: FitResult): string {
  const rc = r.reducedChi2 === null ? 'n/a' : r.reducedChi2.toFixed(3);
  const lines = [
    `χ² = ${r.chi2.toFixed(2)} for ${r.dof} degrees of freedom (χ²/dof = ${rc}); ${r.components} ` +
      `measurement components; ${r.outliers} outlier(s) beyond 5σ`,
    `loss ${r.loss}; derivatives ${r.derivatives}; ${r.iterations} ` +
      `iterations${r.converged ? '' : ' (not converged)'}; next periapsis counted from ${r.asOf}`,
    ...r.stars.map((s) => `${s.name}: next periapsis ${s.nextPeriapsis}`),
  ];
  lines.push(...relativityLines(r));
  if (r.posterior)
    lines.push(
      `posterior: ${r.posterior.samples} draws from an ensemble of ${r.posterior.ensembleSize} × ` +
        `${r.posterior.rounds} rounds (seed ${r.posterior.seed}), acceptance ` +
        `${r.posterior.acceptance.toFixed(2)}`,
    );
  return `${lines.join('\n')}\n`;
}

/** Which terms were on and why (per star when they differ), the fitted factors, the warnings. */
function relativityLines(r: FitResult): string[] {
  const lines: string[] = [];
  const byStar = r.relativity.stars;
  const same = byStar.every(
    (s) => JSON.stringify(s.reasons) === JSON.stringify(byStar[0]!.reasons),
  );
  for (const s of same ? byStar.slice(0, 1) : byStar) {
    const who = same ? 'relativity' : `relativity of ${s.name}`;
    lines.push(
      `${who}: ${Object.entries(s.reasons)
        .map(([term, why]) => `${term} ${why}`)
        .join('; ')}`,
    );
  }
  for (const f of r.relativity.factors.filter((x) => x.fitted))
    lines.push(
      `${f.name} = ${f.value.toFixed(3)} ± ${f.sigma.toFixed(3)}: ${f.detectionSigma.toFixed(1)}σ ` +
        `from 0 (Newtonian), ${f.departureFromGrSigma.toFixed(1)}σ from 1 (general relativity)`,
    );
  for (const w of r.warnings) lines.push(`warning: ${w}`);
  return lines;
}

/** Table output: everything. CSV: the quantities, or the residuals with `residuals`. */
export function renderFit(
  r: FitResult,
  format: 'table' | 'json' | 'csv',
  residuals: boolean,
  extra = '',
): string {
  if (format === 'json') return `${JSON.stringify(r, null, 2)}\n`;
  const cols = r.posterior ? [...QUANTITY_COLUMNS, ...PERCENTILE_COLUMNS] : QUANTITY_COLUMNS;
  if (format === 'csv')
    return residuals ? residualsCsv(r.residuals) : formatCsv(quantityRows(r), cols);
  return [
    extra + summary(r),
    formatTable(quantityRows(r), cols),
    'residuals (o−c: Δα*, Δδ mas | ρ mas, θ deg | v km/s):\n' +
      formatTable(r.residuals, RESIDUAL_COLUMNS),
  ].join('\n');
}
