/**
 * A fit's answer with its residuals bounded: a summary of all of them (per star and kind: count,
 * RMS and worst in σ, outliers) and one page of them in measurement order. A fit of 100,000
 * measurements then answers in kilobytes; every residual stays available as CSV.
 */
import { InputError } from '../../errors.ts';
import type { FitResult } from './result.ts';
import type { Residual } from './types.ts';

/** Which residuals to return: `limit` of them from `offset` (0-based, in measurement order). */
export interface ResidualPageRequest {
  offset?: number;
  limit?: number;
}

/** Residuals per page when the request does not say, and the most one page may hold. */
export const RESIDUAL_PAGE = { defaultLimit: 1000, maxLimit: 10_000 } as const;

export interface ResidualGroup {
  star: string;
  kind: Residual['kind'];
  count: number;
  /** √(mean of (o−c)/σ² over the group's components): about 1 for a good fit. */
  rmsNormalized: number;
  /** The largest |(o−c)/σ| of any component, and the measurement it belongs to. */
  worstNormalized: number;
  worstIndex: number;
  worstId?: string;
  outliers: number;
}

export interface ResidualSummary {
  total: number;
  outliers: number;
  groups: ResidualGroup[];
}

export type PagedFitResult = Omit<FitResult, 'residuals'> & {
  /** The residuals of this page only (`residualPage` says which). */
  residuals: Residual[];
  residualPage: { offset: number; limit: number; total: number };
  residualSummary: ResidualSummary;
};

/** Summary of every residual, by star and kind, in the order they first appear. */
export function summarizeResiduals(residuals: readonly Residual[]): ResidualSummary {
  const groups = new Map<string, ResidualGroup & { sumSq: number; n: number }>();
  for (const r of residuals) {
    const key = `${r.star}\u0000${r.kind}`;
    let g = groups.get(key);
    if (!g) {
      g = {
        star: r.star,
        kind: r.kind,
        count: 0,
        rmsNormalized: 0,
        worstNormalized: -1,
        worstIndex: r.index,
        outliers: 0,
        sumSq: 0,
        n: 0,
      };
      groups.set(key, g);
    }
    g.count++;
    if (r.outlier) g.outliers++;
    for (const z of r.normalized) {
      g.sumSq += z * z;
      g.n++;
      if (Math.abs(z) > g.worstNormalized) {
        g.worstNormalized = Math.abs(z);
        g.worstIndex = r.index;
        if (r.id === undefined) delete g.worstId;
        else g.worstId = r.id;
      }
    }
  }
  const out = [...groups.values()].map(({ sumSq, n, ...g }) => ({
    ...g,
    rmsNormalized: n > 0 ? Math.sqrt(sumSq / n) : 0,
    worstNormalized: Math.max(g.worstNormalized, 0),
  }));
  return {
    total: residuals.length,
    outliers: out.reduce((s, g) => s + g.outliers, 0),
    groups: out,
  };
}

/**
 * The result with one page of residuals and the summary of all.
 * @throws InputError naming `residualPage.offset` / `residualPage.limit` when out of range
 */
export function pageResiduals(result: FitResult, page: ResidualPageRequest = {}): PagedFitResult {
  const offset = page.offset ?? 0;
  const limit = page.limit ?? RESIDUAL_PAGE.defaultLimit;
  if (!Number.isInteger(offset) || offset < 0)
    throw new InputError('residualPage.offset', offset, 'must be an integer ≥ 0');
  if (!Number.isInteger(limit) || limit < 1 || limit > RESIDUAL_PAGE.maxLimit)
    throw new InputError(
      'residualPage.limit',
      limit,
      `must be an integer from 1 to ${RESIDUAL_PAGE.maxLimit} (every residual: ask for the CSV)`,
    );
  return {
    ...result,
    residuals: result.residuals.slice(offset, offset + limit),
    residualPage: { offset, limit, total: result.residuals.length },
    residualSummary: summarizeResiduals(result.residuals),
  };
}
