/**
 * What the orbit-solution form holds and the request body it makes: Campbell elements or
 * Thiele–Innes constants, a 1σ per element with a correlation per pair (or a pasted covariance),
 * and the relativistic terms with their scale factors. Pure, so node tests build bodies too; the
 * rules themselves are the server's (the orbit engine's validation), not repeated here.
 */
import {
  COVARIANCE_TERMS,
  THIELE_INNES_TERMS,
  covarianceOf,
  sigmaColumn,
  type Correlation,
  type UncertainTerm,
} from '../../../descriptors/covariance.ts';
import { RELATIVITY_WORDS } from '../lib/numbers.ts';

export type ElementsKind = 'campbell' | 'thiele-innes';
export type UncertaintyMode = 'sigmas' | 'matrix';

/** One row of the element table: request path, label, and the covariance parameter of its σ. */
export interface ElementRow {
  key: string;
  label: string;
  sigma: UncertainTerm | null;
  hint?: string;
  optional?: boolean;
}

const HEAD: ElementRow[] = [
  { key: 'elements.periodYears', label: 'P, period (yr)', sigma: 'periodYears' },
  {
    key: 'elements.periapsis',
    label: 'T, periapsis epoch',
    sigma: 'periapsisDays',
    hint: 'ISO 8601 with Z or an offset (2031-04-01T00:00-03), JD, MJD or a decimal year (2031.25); its σ in days',
  },
  { key: 'elements.eccentricity', label: 'e, eccentricity', sigma: 'eccentricity' },
];
const CAMPBELL: ElementRow[] = [
  {
    key: 'elements.semiMajorAxisArcsec',
    label: 'a, semi-major axis (″)',
    sigma: 'semiMajorAxisArcsec',
  },
  { key: 'elements.inclinationDeg', label: 'i, inclination (°)', sigma: 'inclinationDeg' },
  { key: 'elements.ascendingNodeDeg', label: 'Ω, ascending node (°)', sigma: 'ascendingNodeDeg' },
  {
    key: 'elements.argPeriapsisDeg',
    label: 'ω, argument of periapsis (°)',
    sigma: 'argPeriapsisDeg',
  },
];
const THIELE_INNES: ElementRow[] = [
  { key: 'elements.aArcsec', label: 'A (″)', sigma: 'aArcsec', hint: 'Δδ = A·X + F·Y' },
  { key: 'elements.bArcsec', label: 'B (″)', sigma: 'bArcsec', hint: 'Δα* = B·X + G·Y' },
  { key: 'elements.fArcsec', label: 'F (″)', sigma: 'fArcsec' },
  { key: 'elements.gArcsec', label: 'G (″)', sigma: 'gArcsec' },
];
const TAIL: ElementRow[] = [
  { key: 'distancePc', label: 'distance (pc, optional)', sigma: 'distancePc', optional: true },
  {
    key: 'systemicVelocityKmS',
    label: 'γ, systemic velocity (km/s, optional)',
    sigma: 'systemicVelocityKmS',
    optional: true,
  },
  {
    key: 'massRatio',
    label: 'q = M₂/M₁, mass ratio (optional)',
    sigma: 'massRatio',
    hint: 'a binary of comparable masses: gives each body’s velocity',
    optional: true,
  },
  {
    key: 'lightFraction',
    label: 'β = L₂/(L₁+L₂), light fraction (optional)',
    sigma: 'lightFraction',
    hint: 'the secondary’s share of the light: with q, the photocentre',
    optional: true,
  },
];

/** The rows the form asks for with elements of this kind. */
export const elementRows = (kind: ElementsKind) => [
  ...HEAD,
  ...(kind === 'campbell' ? CAMPBELL : THIELE_INNES),
  ...TAIL,
];

export const RELATIVITY_SWITCHES = Object.keys(RELATIVITY_WORDS) as (
  | 'romer'
  | 'gravitationalRedshift'
  | 'transverseDoppler'
  | 'precession'
)[];
export const FACTORS = [
  { key: 'redshiftFactor', label: 'redshift factor (scales redshift and transverse Doppler)' },
  { key: 'precessionFactor', label: 'precession factor (scales Δω)' },
] as const;

/** Everything typed into the form, as text (numbers are read on submit). */
export interface SolutionDraft {
  kind: ElementsKind;
  values: Record<string, string>;
  sigmas: Partial<Record<UncertainTerm, string>>;
  rho: Record<string, string>;
  mode: UncertaintyMode;
  matrixText: string;
  relativity: Partial<Record<(typeof RELATIVITY_SWITCHES)[number], boolean>>;
  factors: Partial<Record<(typeof FACTORS)[number]['key'], string>>;
}

export const EMPTY_DRAFT: SolutionDraft = {
  kind: 'campbell',
  values: {},
  sigmas: {},
  rho: {},
  mode: 'sigmas',
  matrixText: '',
  relativity: {},
  factors: {},
};

/** A problem found before sending: the form field it belongs to and the rule. */
export interface LocalProblem {
  field: string;
  rule: string;
}

const numberOf = (field: string, text: string): number | LocalProblem => {
  const x = text.trim() === '' ? NaN : Number(text.trim());
  return Number.isFinite(x)
    ? x
    : { field, rule: `${JSON.stringify(text)} must be a number (use a decimal point)` };
};

/** The element pairs that can carry a correlation: those with a σ typed, in table order. */
export function correlationPairs(d: SolutionDraft): [UncertainTerm, UncertainTerm][] {
  const withSigma = elementRows(d.kind).flatMap((r) =>
    r.sigma && (d.sigmas[r.sigma] ?? '').trim() !== '' ? [r.sigma] : [],
  );
  return withSigma.flatMap((a, i) =>
    withSigma.slice(i + 1).map((b) => [a, b] as [typeof a, typeof b]),
  );
}

/**
 * A pasted covariance: a first row naming the parameters by their symbols (P T e a i Ω ω d γ q β,
 * A B F G for Thiele–Innes constants; case matters: a is the semi-major axis, A a constant) or by
 * the API's names, then one row of numbers per parameter.
 */
export function parseCovarianceText(
  text: string,
): { parameters: string[]; matrix: number[][] } | { rule: string } {
  const rows = text
    .trim()
    .split(/\n+/)
    .map((l) =>
      l
        .trim()
        .split(/[\s,;]+/)
        .filter(Boolean),
    );
  const [heads, ...body] = rows;
  if (!heads?.length) return { rule: 'is empty: give a row of element symbols, then the matrix' };
  const terms = [...COVARIANCE_TERMS, ...THIELE_INNES_TERMS];
  const names = heads.map(
    (h) => terms.find((t) => t.symbol === h || t.parameter === h)?.parameter ?? h,
  );
  const unknown = heads.filter((_, k) => !terms.some((t) => t.parameter === names[k]));
  if (unknown.length)
    return {
      rule:
        `names ${unknown.join(', ')}: the first row must name elements among ` +
        `${terms.map((t) => t.symbol).join(' ')}`,
    };
  if (body.length !== names.length || body.some((r) => r.length !== names.length))
    return { rule: `must have ${names.length} rows of ${names.length} numbers under the names` };
  const matrix = body.map((r) => r.map(Number));
  if (matrix.flat().some((x) => !Number.isFinite(x)))
    return { rule: 'holds a cell that is not a number (use a decimal point)' };
  return { parameters: names, matrix };
}

/** The form input of a covariance problem: `sigmaPeriodYears` → `sigma-periodYears`, `correlations a/b` → `rho-a-b`. */
function formFieldOf(field: string): string {
  const pair = /^correlations (\w+)\/(\w+)$/.exec(field);
  if (pair) return `rho-${pair[1]}-${pair[2]}`;
  const term = [...COVARIANCE_TERMS, ...THIELE_INNES_TERMS].find(
    (t) => sigmaColumn(t.parameter) === field,
  );
  return term ? `sigma-${term.parameter}` : 'covariance';
}

function covarianceOfDraft(d: SolutionDraft): object | null | LocalProblem {
  if (d.mode === 'matrix') {
    if (!d.matrixText.trim()) return null;
    const m = parseCovarianceText(d.matrixText);
    return 'rule' in m ? { field: 'covariance', rule: m.rule } : m;
  }
  const sigmas: Partial<Record<UncertainTerm, number>> = {};
  for (const r of elementRows(d.kind)) {
    const text = r.sigma ? (d.sigmas[r.sigma] ?? '').trim() : '';
    if (r.sigma && text) sigmas[r.sigma] = Number(text);
  }
  const correlations: Correlation[] = correlationPairs(d).flatMap(([a, b]) => {
    const text = (d.rho[`${a}/${b}`] ?? '').trim();
    return text === '' ? [] : [{ a, b, rho: Number(text) }];
  });
  const cov = covarianceOf(sigmas, correlations);
  if (cov && 'rule' in cov) return { field: formFieldOf(cov.field), rule: cov.rule };
  return cov;
}

/** The orbit of the request body, or the first problem the form can name before sending. */
export function orbitOfDraft(d: SolutionDraft): { orbit: Record<string, unknown> } | LocalProblem {
  const elements: Record<string, unknown> = d.kind === 'campbell' ? {} : { kind: d.kind };
  const orbit: Record<string, unknown> = { elements };
  for (const r of elementRows(d.kind)) {
    const text = (d.values[r.key] ?? '').trim();
    if (text === '' && r.optional) continue;
    const value = r.key === 'elements.periapsis' ? text : numberOf(r.key, text);
    if (typeof value === 'object') return value;
    const [head, tail] = r.key.split('.') as [string, string | undefined];
    if (tail) elements[tail] = value;
    else orbit[head] = value;
  }
  const on = RELATIVITY_SWITCHES.filter((s) => d.relativity[s]);
  if (on.length) orbit.relativity = Object.fromEntries(on.map((s) => [s, true]));
  const factors: Record<string, number> = {};
  for (const f of FACTORS) {
    const text = (d.factors[f.key] ?? '').trim();
    if (text === '') continue;
    const x = numberOf(`relativityFactors.${f.key}`, text);
    if (typeof x === 'object') return x;
    factors[f.key] = x;
  }
  if (Object.keys(factors).length) orbit.relativityFactors = factors;
  const cov = covarianceOfDraft(d);
  if (cov && 'rule' in cov) return cov as LocalProblem;
  if (cov) orbit.covariance = cov;
  return { orbit };
}
