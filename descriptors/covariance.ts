/**
 * An orbit's uncertainty written as people write it — a 1σ per element and a correlation per
 * pair — and as the store keeps it, a covariance matrix over named parameters (the orbit
 * engine's COVARIANCE_PARAMETERS, in these units). The client's solution form, the orbit CSV
 * layout and its export read and write it through these two functions only. Imports nothing.
 */

/** The parameters a covariance may cover, their units and the labels people read. */
export const COVARIANCE_TERMS = [
  { parameter: 'periodYears', symbol: 'P', unit: 'yr' },
  { parameter: 'periapsisDays', symbol: 'T', unit: 'd' },
  { parameter: 'eccentricity', symbol: 'e', unit: '' },
  { parameter: 'semiMajorAxisArcsec', symbol: 'a', unit: '″' },
  { parameter: 'inclinationDeg', symbol: 'i', unit: '°' },
  { parameter: 'ascendingNodeDeg', symbol: 'Ω', unit: '°' },
  { parameter: 'argPeriapsisDeg', symbol: 'ω', unit: '°' },
  { parameter: 'distancePc', symbol: 'd', unit: 'pc' },
  { parameter: 'systemicVelocityKmS', symbol: 'γ', unit: 'km/s' },
  { parameter: 'massRatio', symbol: 'q', unit: '' },
  { parameter: 'lightFraction', symbol: 'β', unit: '' },
] as const;
export type CovarianceTerm = (typeof COVARIANCE_TERMS)[number]['parameter'];
/**
 * Thiele–Innes constants: a solution given in them may take its σ and correlations over A, B, F,
 * G; the orbit engine carries them to a, i, Ω, ω by first-order propagation before storing.
 */
export const THIELE_INNES_TERMS = [
  { parameter: 'aArcsec', symbol: 'A', unit: '″' },
  { parameter: 'bArcsec', symbol: 'B', unit: '″' },
  { parameter: 'fArcsec', symbol: 'F', unit: '″' },
  { parameter: 'gArcsec', symbol: 'G', unit: '″' },
] as const;
/** A parameter a typed-in uncertainty may cover: a stored one, or a Thiele–Innes constant. */
export type UncertainTerm = CovarianceTerm | (typeof THIELE_INNES_TERMS)[number]['parameter'];
const TERM_ORDER: readonly UncertainTerm[] = [...COVARIANCE_TERMS, ...THIELE_INNES_TERMS].map(
  (t) => t.parameter,
);

/** The CSV column of a parameter's 1σ: `sigmaPeriodYears`, `sigmaPeriapsisDays`, … */
export const sigmaColumn = (p: UncertainTerm) => `sigma${p[0]!.toUpperCase()}${p.slice(1)}`;
/** Every σ column of the orbit CSV layout: the stored parameters', then A, B, F, G's (Thiele–Innes rows). */
export const SIGMA_COLUMNS = [...COVARIANCE_TERMS, ...THIELE_INNES_TERMS].map((t) =>
  sigmaColumn(t.parameter),
);
/** The CSV column of the correlations: `periodYears/periapsisDays=0.42; eccentricity/periapsisDays=-0.1`. */
export const CORRELATIONS_COLUMN = 'correlations';

export interface Correlation {
  a: UncertainTerm;
  b: UncertainTerm;
  rho: number;
}

/**
 * The covariance of the parameters with a σ: C_ii = σ_i², C_ij = ρ_ij σ_i σ_j (ρ = 0 when not
 * given). Returns null when no σ is given, or the first problem as { field, value, rule }.
 */
export function covarianceOf(
  sigmas: Partial<Record<UncertainTerm, number>>,
  correlations: readonly Correlation[] = [],
):
  | { parameters: UncertainTerm[]; matrix: number[][] }
  | null
  | { field: string; value: unknown; rule: string } {
  const parameters = TERM_ORDER.filter((p) => sigmas[p] !== undefined);
  for (const p of parameters) {
    const s = sigmas[p]!;
    if (!(Number.isFinite(s) && s > 0))
      return { field: sigmaColumn(p), value: s, rule: 'must be a positive number' };
  }
  const rho = new Map<string, number>();
  for (const c of correlations) {
    const where = `${CORRELATIONS_COLUMN} ${c.a}/${c.b}`;
    if (c.a === c.b) return { field: where, value: c.rho, rule: 'pairs a parameter with itself' };
    if (!(c.rho >= -1 && c.rho <= 1))
      return { field: where, value: c.rho, rule: 'must lie in [−1, 1]' };
    if (sigmas[c.a] === undefined || sigmas[c.b] === undefined)
      return { field: where, value: c.rho, rule: 'needs a σ for both parameters' };
    const key = [c.a, c.b].sort().join('/');
    if (rho.has(key)) return { field: where, value: c.rho, rule: 'is given twice' };
    rho.set(key, c.rho);
  }
  if (!parameters.length) return null;
  const matrix = parameters.map((a) =>
    parameters.map((b) =>
      a === b ? sigmas[a]! ** 2 : (rho.get([a, b].sort().join('/')) ?? 0) * sigmas[a]! * sigmas[b]!,
    ),
  );
  return { parameters, matrix };
}

/** The σ and correlations of a covariance (the inverse of covarianceOf; ρ below 1e-12 left out). */
export function sigmasOf(cov: { parameters: readonly string[]; matrix: readonly number[][] }): {
  sigmas: Partial<Record<CovarianceTerm, number>>;
  correlations: Correlation[];
} {
  const sigmas: Partial<Record<CovarianceTerm, number>> = {};
  const s = cov.parameters.map((_, i) => Math.sqrt(cov.matrix[i]?.[i] ?? 0));
  cov.parameters.forEach((p, i) => {
    sigmas[p as CovarianceTerm] = s[i]!;
  });
  const correlations: Correlation[] = [];
  for (let i = 0; i < cov.parameters.length; i++)
    for (let j = i + 1; j < cov.parameters.length; j++) {
      const rho = (cov.matrix[i]?.[j] ?? 0) / (s[i]! * s[j]!);
      if (Math.abs(rho) > 1e-12)
        correlations.push({
          a: cov.parameters[i] as CovarianceTerm,
          b: cov.parameters[j] as CovarianceTerm,
          rho,
        });
    }
  return { sigmas, correlations };
}

/** Read a correlations cell: `a/b=ρ` pairs separated by ";" (the rule of a bad pair, or the list). */
export function parseCorrelations(text: string): Correlation[] | { value: string; rule: string } {
  const names = new Set<string>(TERM_ORDER);
  const out: Correlation[] = [];
  for (const part of text
    .split(';')
    .map((x) => x.trim())
    .filter(Boolean)) {
    const m = /^(\w+)\s*\/\s*(\w+)\s*=\s*(-?\d*\.?\d+(?:e-?\d+)?)$/i.exec(part);
    if (!m || !names.has(m[1]!) || !names.has(m[2]!))
      return {
        value: part,
        rule:
          'must be pairs such as "eccentricity/periapsisDays=0.35" separated by ";", with ' +
          'names of the σ columns’ parameters',
      };
    out.push({ a: m[1] as UncertainTerm, b: m[2] as UncertainTerm, rho: Number(m[3]) });
  }
  return out;
}

/** A correlations cell for a list (the CSV export's form, read back by parseCorrelations). */
export const correlationsText = (list: readonly Correlation[]) =>
  list.map((c) => `${c.a}/${c.b}=${Number(c.rho.toPrecision(12))}`).join('; ');
