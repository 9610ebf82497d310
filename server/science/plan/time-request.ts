/**
 * A semester's time request from a season plan: per site the nights and hours the plan's blocks
 * need, split by target and measurement kind, and the weather allowance from the learned clear
 * chance of each night; per target the expected result with and without the time (σ of the coming
 * passage's date and of the mass from the plan, the relativity factors from the detection
 * forecast) and one paragraph written from those numbers.
 *
 * The allowance: to expect h hours of clear time on a night clear with chance c, ask for h / c, so
 * the allowance of a block of h hours is h (1 − c) / c (common practice, no source). The request of
 * a site is its blocks' hours plus their allowances, exactly.
 */
import type { BlockKind } from './candidates.ts';
import type { SeasonPlan } from './season-types.ts';

export interface SemesterInput {
  /** The semester's name as the proposal gives it (e.g. "2027A"). */
  name: string;
  startDate: string;
  endDate: string;
}

export interface FactorResult {
  name: 'redshiftFactor' | 'precessionFactor';
  /** Fisher 1σ without the requested time (measurements so far) and with it; null: not determined. */
  without: number | null;
  with: number | null;
}

export interface SiteRequest {
  site: string;
  nights: number;
  /** The plan's blocks, hours. */
  hours: number;
  /** The weather allowance, hours (Σ h (1 − c) / c over the blocks). */
  allowanceHours: number;
  /** hours + allowanceHours. */
  requestHours: number;
  /** Mean clear chance over the blocks' nights (hours-weighted). */
  clearChance: number;
  byTarget: {
    target: string;
    kind: BlockKind;
    blocks: number;
    hours: number;
    allowanceHours: number;
  }[];
}

export interface TargetResult {
  target: string;
  hours: number;
  allowanceHours: number;
  passage: string | null;
  periapsisSigmaDays: { without: number | null; with: number | null };
  massFraction: { without: number | null; with: number | null };
  coverage: { withinDays: number; without: number; with: number } | null;
  factors: FactorResult[];
  reason: string;
}

export interface TimeRequest {
  semester: SemesterInput;
  sites: SiteRequest[];
  targets: TargetResult[];
  totals: { hours: number; allowanceHours: number; requestHours: number; nights: number };
  rule: string;
  /** How "with" and "without" the requested time are computed. */
  method: string;
}

export const ALLOWANCE_RULE =
  'weather allowance per block: its hours × (1 − c) / c, with c the chance its night is clear (learned ' +
  'from the site’s log and prior); request = blocks + allowance';

/** How the expected results are reckoned, stated with every request. */
export const RESULT_METHOD =
  'with and without the time: linear (Fisher) 1σ from the current orbit solution and the stored ' +
  'measurements, and the blocks already on the semester’s nights that stay, without the requested ' +
  'blocks and with all of them at their expected σ (the weather allowance is what makes obtaining them ' +
  'the expectation; the season Monte Carlo gives the spread if nights are lost beyond it)';

const LEAST_CLEAR = 0.01;
const h1 = (x: number) => x.toFixed(1);
const sig = (x: number | null, unit: string, digits = 2) =>
  x === null ? 'undetermined' : `± ${x.toFixed(digits)}${unit}`;

/** σ of a relativity factor (1 in general relativity): two decimals below 10, none above (± 31, not ± 30.88). */
const factorSigma = (x: number | null) =>
  x === null ? 'undetermined' : sig(x, '', x >= 10 ? 0 : 2);

/** σ of a date: in hours up to two days, in days beyond. */
const dateSigma = (days: number | null) =>
  days === null ? 'undetermined' : days * 24 < 48 ? sig(days * 24, ' h', 1) : sig(days, ' d', 1);

function paragraph(t: Omit<TargetResult, 'reason'>, sites: SiteRequest[]): string {
  const where = sites
    .flatMap((s) => s.byTarget.filter((b) => b.target === t.target).map((b) => ({ s: s.site, b })))
    .map(({ s, b }) => `${b.blocks} ${b.kind} block${b.blocks === 1 ? '' : 's'} at ${s}`)
    .join(', ');
  if (t.hours === 0) return `${t.target}: no time is requested this semester (no block planned).`;
  const parts = [
    `${t.target}: ${h1(t.hours)} h (${where}) plus ${h1(t.allowanceHours)} h for weather.`,
  ];
  if (t.passage)
    parts.push(
      `It passes periapsis on ${t.passage.slice(0, 10)}; with this time the date would be known to ` +
        `${dateSigma(t.periapsisSigmaDays.with)}, against ${dateSigma(t.periapsisSigmaDays.without)} without it` +
        (t.coverage
          ? `, and ${(100 * t.coverage.with).toFixed(0)} % of the date’s distribution would lie within ` +
            `${t.coverage.withinDays} d of an epoch (${(100 * t.coverage.without).toFixed(0)} % without)`
          : '') +
        '.',
    );
  if (t.massFraction.with !== null)
    parts.push(
      `The mass would be known to ${(100 * t.massFraction.with).toFixed(2)} % ` +
        `(${t.massFraction.without === null ? 'undetermined' : `${(100 * t.massFraction.without).toFixed(2)} %`} without).`,
    );
  for (const f of t.factors)
    if (f.with !== null && (f.without === null || f.with < f.without))
      parts.push(
        `The ${f.name === 'redshiftFactor' ? 'redshift' : 'precession'} factor would reach ` +
          `${factorSigma(f.with)} (${(1 / f.with).toFixed(1)}σ if general relativity holds), against ` +
          `${factorSigma(f.without)} without.`,
      );
  return parts.join(' ');
}

/**
 * @param plan the season plan of the semester's range
 * @param clear chance each site-night is clear, by site name and local evening date (missing: 1)
 * @param factors per target, the relativity factors' σ without and with the plan's epochs
 */
export function timeRequest(
  semester: SemesterInput,
  plan: SeasonPlan,
  clear: Readonly<Record<string, Readonly<Record<string, number>>>>,
  factors: Readonly<Record<string, FactorResult[]>> = {},
): TimeRequest {
  const chance = (site: string, date: string) =>
    Math.max(LEAST_CLEAR, Math.min(1, clear[site]?.[date] ?? 1));
  const sites = plan.sites.map((s) =>
    siteRequest(
      s.name,
      plan.epochs.filter((e) => e.site === s.name),
      chance,
    ),
  );
  const targets = plan.targets.map((t) => targetResult(t, sites, factors[t.target] ?? []));
  const sum = (f: (s: SiteRequest) => number) => sites.reduce((a, s) => a + f(s), 0);
  return {
    semester,
    sites,
    targets,
    totals: {
      hours: sum((s) => s.hours),
      allowanceHours: sum((s) => s.allowanceHours),
      requestHours: sum((s) => s.requestHours),
      nights: sum((s) => s.nights),
    },
    rule: ALLOWANCE_RULE,
    method: RESULT_METHOD,
  };
}

/** One site's hours: its planned blocks, the weather allowance each needs, by target and kind. */
function siteRequest(
  site: string,
  mine: readonly SeasonPlan['epochs'][number][],
  chance: (site: string, date: string) => number,
): SiteRequest {
  const groups = new Map<string, SiteRequest['byTarget'][number]>();
  let hours = 0,
    allowance = 0,
    weighted = 0;
  for (const e of mine) {
    const h = e.block.minutes / 60;
    const c = chance(site, e.date);
    const a = (h * (1 - c)) / c;
    hours += h;
    allowance += a;
    weighted += h * c;
    const key = `${e.target}\u0000${e.kind}`;
    const g = groups.get(key) ?? {
      target: e.target,
      kind: e.kind,
      blocks: 0,
      hours: 0,
      allowanceHours: 0,
    };
    g.blocks++;
    g.hours += h;
    g.allowanceHours += a;
    groups.set(key, g);
  }
  return {
    site,
    nights: new Set(mine.map((e) => e.date)).size,
    hours,
    allowanceHours: allowance,
    requestHours: hours + allowance,
    clearChance: hours > 0 ? weighted / hours : 1,
    byTarget: [...groups.values()].sort(
      (a, b) => a.target.localeCompare(b.target) || a.kind.localeCompare(b.kind),
    ),
  };
}

/** One target's hours over the sites, what the plan gains it, and the paragraph that argues for it. */
function targetResult(
  t: SeasonPlan['targets'][number],
  sites: SiteRequest[],
  factors: FactorResult[],
): TargetResult {
  const rows = sites.flatMap((s) => s.byTarget.filter((b) => b.target === t.target));
  const base: Omit<TargetResult, 'reason'> = {
    target: t.target,
    hours: rows.reduce((a, b) => a + b.hours, 0),
    allowanceHours: rows.reduce((a, b) => a + b.allowanceHours, 0),
    passage: t.passage?.date ?? null,
    periapsisSigmaDays: {
      without: t.shrinkage?.periapsisDays.before ?? null,
      with: t.shrinkage?.periapsisDays.after ?? null,
    },
    massFraction: {
      without: t.shrinkage?.massFraction.before ?? null,
      with: t.shrinkage?.massFraction.after ?? null,
    },
    coverage: t.passage
      ? {
          withinDays: t.passage.coverage.withinDays,
          without: t.passage.coverage.before,
          with: t.passage.coverage.after,
        }
      : null,
    factors,
  };
  return { ...base, reason: paragraph(base, sites) };
}

export function timeRequestMarkdown(r: TimeRequest): string {
  const out = [
    `# Time request, semester ${r.semester.name} (${r.semester.startDate} to ${r.semester.endDate})`,
    '',
    `Total: ${h1(r.totals.requestHours)} h on ${r.totals.nights} site-nights (${h1(r.totals.hours)} ` +
      `h of planned blocks plus ${h1(r.totals.allowanceHours)} h weather allowance).`,
    '',
  ];
  for (const s of r.sites) {
    out.push(
      `## ${s.site}: ${h1(s.requestHours)} h`,
      '',
      `${s.nights} nights; ${h1(s.hours)} h of blocks plus ${h1(s.allowanceHours)} h for weather ` +
        `(nights clear with chance ${(100 * s.clearChance).toFixed(0)} % on average).`,
      '',
      '| target | kind | blocks | hours | weather allowance (h) |',
      '| --- | --- | ---: | ---: | ---: |',
      ...s.byTarget.map(
        (b) =>
          `| ${b.target} | ${b.kind} | ${b.blocks} | ${h1(b.hours)} | ${h1(b.allowanceHours)} |`,
      ),
      '',
    );
  }
  out.push(
    '## Why',
    '',
    ...r.targets.flatMap((t) => [t.reason, '']),
    `Rule: ${r.rule}.`,
    '',
    `Expected results: ${r.method}.`,
    '',
  );
  return out.join('\n');
}
