/**
 * A fit request checked field by field before anything is computed. Errors name the dotted path
 * of the field, its value and the rule, as everywhere in the engine.
 */
import { InputError, requireFinite } from '../../errors.ts';
import { parseEpoch } from '../../time/index.ts';
import { validateOrbit } from '../elements.ts';
import type { Orbit, RelativitySwitches } from '../types.ts';
import { readMeasurements, type Observation } from './measurements.ts';
import type {
  FitRequest,
  PriorInput,
  RangeHint,
  RelativityFactorName,
  SamplerOptions,
  StarHints,
  StarInput,
} from './types.ts';

export interface CheckedStar {
  name: string;
  obs: Observation[];
  hints: StarHints;
  /** The validated starting orbit of hints.start, or null. */
  start: Orbit | null;
  /** The star's relativistic terms (the request's, then the star's own, then the free factors'). */
  relativity: RelativitySwitches;
  relativityReasons: Record<keyof RelativitySwitches, string>;
}

export interface CheckedRequest {
  stars: CheckedStar[];
  /** Every term that any star has on. */
  relativity: RelativitySwitches;
  /** Which relativity factors are free parameters. */
  freeFactors: Record<RelativityFactorName, boolean>;
  /** Per term, why it is on or off for the request as a whole (stated in the fit's output). */
  relativityReasons: Record<keyof RelativitySwitches, string>;
  frameOffset: boolean;
  frameDrift: boolean;
  frameEpochJd: number | null;
  fixed: [string, number][];
  priors: [string, PriorInput][];
  loss: 'gaussian' | 'huber';
  asOfJd: number | null;
  posterior: Required<SamplerOptions> | null;
}

const NAME_RE = /^[^\s\p{Cc}][^\p{Cc}]{0,79}$/u;
const SWITCHES = ['romer', 'gravitationalRedshift', 'transverseDoppler', 'precession'] as const;

const NEWTONIAN: RelativitySwitches = {
  romer: false,
  gravitationalRedshift: false,
  transverseDoppler: false,
  precession: false,
};

/** The switches given at `field` (all optional), checked. */
function checkSwitches(field: string, v: unknown): Partial<RelativitySwitches> {
  if (v === undefined) return {};
  if (typeof v !== 'object' || v === null)
    throw new InputError(field, v, 'must be an object of switches');
  const out: Partial<RelativitySwitches> = {};
  for (const [key, x] of Object.entries(v)) {
    if (!(SWITCHES as readonly string[]).includes(key))
      throw new InputError(`${field}.${key}`, x, `is not a switch; known: ${SWITCHES.join(', ')}`);
    out[key as keyof RelativitySwitches] = boolOf(`${field}.${key}`, x);
  }
  return out;
}

/** A star's switches and why each is on or off: its own, else the request's, else off; free factors force theirs on. */
function starRelativity(
  req: FitRequest,
  own: unknown,
  field: string,
  free: Record<RelativityFactorName, boolean>,
): Pick<CheckedStar, 'relativity' | 'relativityReasons'> {
  const mine = checkSwitches(field, own);
  const shared = checkSwitches('relativity', req.relativity);
  const origin = req.relativityOrigin ?? 'the request';
  const relativity = { ...NEWTONIAN };
  const reasons = {} as Record<keyof RelativitySwitches, string>;
  for (const k of SWITCHES) {
    const v = mine[k] ?? shared[k];
    relativity[k] = v ?? false;
    reasons[k] =
      v === undefined
        ? 'off: not asked for (a fit is Newtonian unless told otherwise)'
        : `${v ? 'on' : 'off'}: ${mine[k] !== undefined ? `the star's own switches (${origin})` : origin}`;
  }
  if (free.redshiftFactor) {
    relativity.gravitationalRedshift = relativity.transverseDoppler = true;
    reasons.gravitationalRedshift = reasons.transverseDoppler = 'on: the redshift factor is fitted';
  }
  if (free.precessionFactor) {
    relativity.precession = true;
    reasons.precession = 'on: the precession factor is fitted';
  }
  return { relativity, relativityReasons: reasons };
}

function epoch(field: string, v: unknown): number {
  return typeof v === 'number' ? requireFinite(field, v) : parseEpoch(v, field);
}

function range(field: string, v: unknown, lo: number, hi: number): RangeHint {
  if (typeof v !== 'object' || v === null)
    throw new InputError(field, v, 'must be an object { min, max }');
  const r = v as Record<string, unknown>;
  const min = requireFinite(`${field}.min`, r.min),
    max = requireFinite(`${field}.max`, r.max);
  if (!(min >= lo)) throw new InputError(`${field}.min`, min, `must be ≥ ${lo}`);
  if (!(max <= hi)) throw new InputError(`${field}.max`, max, `must be ≤ ${hi}`);
  if (!(max >= min)) throw new InputError(`${field}.max`, max, `must be ≥ min (${min})`);
  return { min, max };
}

function boolOf(field: string, v: unknown): boolean {
  if (v === undefined) return false;
  if (typeof v !== 'boolean') throw new InputError(field, v, 'must be true or false');
  return v;
}

export function checkRequest(req: FitRequest): CheckedRequest {
  if (typeof req !== 'object' || req === null)
    throw new InputError('request', req, 'must be an object');
  if (!Array.isArray(req.stars) || req.stars.length === 0)
    throw new InputError(
      'stars',
      req.stars,
      'must be a non-empty list of stars with their measurements',
    );
  if (req.stars.length > 20)
    throw new InputError('stars', req.stars.length, 'must list at most 20 stars');
  const freeFactors = checkFreeFactors(req.freeFactors);
  checkSwitches('relativity', req.relativity);
  const names = new Set<string>();
  const stars = req.stars.map((s, k) => checkStar(req, s, k, names, freeFactors));
  for (const [k, st] of stars.entries()) checkComponents(st, k, stars.length);
  const relativity = { ...NEWTONIAN };
  for (const st of stars)
    for (const k of SWITCHES) relativity[k] = relativity[k] || st.relativity[k];
  const reasons = starRelativity(req, undefined, 'relativity', freeFactors).relativityReasons;
  const frame = req.frame ?? {};
  if (typeof frame !== 'object' || frame === null)
    throw new InputError('frame', frame, 'must be an object { offset, drift }');
  const fixed = Object.entries(req.fixed ?? {}).map(([k, v]): [string, number] => [
    k,
    requireFinite(`fixed.${k}`, v),
  ]);
  const priors = checkPriors(req.priors);
  const loss = req.loss ?? 'gaussian';
  if (loss !== 'gaussian' && loss !== 'huber')
    throw new InputError('loss', loss, 'must be "gaussian" or "huber"');
  return {
    stars,
    relativity,
    freeFactors,
    relativityReasons: reasons,
    fixed,
    priors,
    loss,
    frameOffset: boolOf('frame.offset', frame.offset),
    frameDrift: boolOf('frame.drift', frame.drift),
    frameEpochJd: req.frameEpoch === undefined ? null : epoch('frameEpoch', req.frameEpoch),
    asOfJd: req.asOf === undefined ? null : epoch('asOf', req.asOf),
    posterior: req.posterior === undefined ? null : checkSampler(req.posterior),
  };
}

/** One star of the request: a name of its own, its hints, its starting orbit and measurements. */
function checkStar(
  req: FitRequest,
  s: StarInput,
  k: number,
  names: Set<string>,
  freeFactors: CheckedRequest['freeFactors'],
): CheckedStar {
  const p = `stars.${k}`;
  if (typeof s !== 'object' || s === null) throw new InputError(p, s, 'must be an object');
  if (typeof s.name !== 'string' || !NAME_RE.test(s.name))
    throw new InputError(
      `${p}.name`,
      s.name,
      'must be 1–80 characters without control characters, not starting with a space',
    );
  if (names.has(s.name)) throw new InputError(`${p}.name`, s.name, 'appears twice');
  names.add(s.name);
  const hints = starHints(s.hints, p);
  const st = s.hints?.start;
  const start =
    st === undefined
      ? null
      : validateOrbit(
          {
            elements: st.elements,
            ...(st.distancePc !== undefined ? { distancePc: st.distancePc } : {}),
            ...(st.systemicVelocityKmS !== undefined
              ? { systemicVelocityKmS: st.systemicVelocityKmS }
              : {}),
            ...(st.massRatio !== undefined ? { massRatio: st.massRatio } : {}),
          },
          `${p}.hints.start`,
        );
  return {
    name: s.name,
    obs: readMeasurements(s.measurements, `${p}.measurements`),
    hints,
    start,
    ...starRelativity(req, s.relativity, `${p}.relativity`, freeFactors),
  };
}

/** The ranges a star's grid search is held to, each checked against its physical bounds, and whether it runs. */
function starHints(input: StarInput['hints'], p: string): StarHints {
  const hints: StarHints = {};
  if (input === undefined) return hints;
  if (typeof input !== 'object' || input === null)
    throw new InputError(`${p}.hints`, input, 'must be an object');
  if (input.periodYears !== undefined)
    hints.periodYears = range(`${p}.hints.periodYears`, input.periodYears, 1e-6, 1e6);
  if (input.eccentricity !== undefined)
    hints.eccentricity = range(`${p}.hints.eccentricity`, input.eccentricity, 0, 0.99);
  if (input.startOnly !== undefined) {
    hints.startOnly = boolOf(`${p}.hints.startOnly`, input.startOnly);
    if (hints.startOnly && input.start === undefined)
      throw new InputError(`${p}.hints.startOnly`, true, 'needs hints.start to start from');
  }
  return hints;
}

/** Gaussian priors by parameter name: a finite mean and a positive σ. */
function checkPriors(input: FitRequest['priors']): [string, PriorInput][] {
  return Object.entries(input ?? {}).map(([k, v]): [string, PriorInput] => {
    if (typeof v !== 'object' || v === null)
      throw new InputError(`priors.${k}`, v, 'must be an object { mean, sigma }');
    const sigma = requireFinite(`priors.${k}.sigma`, v.sigma);
    if (!(sigma > 0)) throw new InputError(`priors.${k}.sigma`, sigma, 'must be greater than 0');
    return [k, { mean: requireFinite(`priors.${k}.mean`, v.mean), sigma }];
  });
}

/**
 * A star's radial velocities are all `relative` (the primary at rest) or all about the barycentre
 * (`primary`, `secondary`, with the mass ratio fitted): the two models cannot share one orbit. The
 * barycentric model is for one binary at a time, Newtonian (the relativistic terms are written for
 * a star around a compact object).
 */
function checkComponents(star: CheckedStar, k: number, starCount: number): void {
  const rv = star.obs.filter((m) => m.kind === 'radial-velocity');
  const bary = star.obs.find((m) => m.component !== 'relative');
  if (!bary) return;
  const field = `stars.${k}.measurements.${bary.index}.component`;
  const relative = rv.find((m) => m.component === 'relative');
  const baryRv = rv.find((m) => m.component !== 'relative');
  if (relative && baryRv)
    throw new InputError(
      `stars.${k}.measurements.${relative.index}.component`,
      'relative',
      `cannot be mixed with "${baryRv.component}" velocities of the same star: a velocity with ` +
        `the primary at rest and one about the barycentre belong to different models — mark ` +
        `every velocity "primary" or "secondary"`,
    );
  if (starCount > 1)
    throw new InputError(
      field,
      bary.component,
      'a joint fit models stars around one primary at rest: velocities and positions must be ' +
        '"relative" there — fit a binary of comparable masses on its own',
    );
  const on = SWITCHES.filter((s) => star.relativity[s]);
  if (on.length > 0)
    throw new InputError(
      field,
      bary.component,
      `velocities about the barycentre and photocentre positions are modelled without ` +
        `relativistic terms, and ${on.join(', ')} ${on.length === 1 ? 'is' : 'are'} on — switch ` +
        `${on.length === 1 ? 'it' : 'them'} off for a binary of comparable masses`,
    );
}

const FACTORS: readonly RelativityFactorName[] = ['redshiftFactor', 'precessionFactor'];

function checkFreeFactors(v: unknown): Record<RelativityFactorName, boolean> {
  const out = { redshiftFactor: false, precessionFactor: false };
  if (v === undefined) return out;
  if (!Array.isArray(v))
    throw new InputError('freeFactors', v, `must be a list of ${FACTORS.join(', ')}`);
  v.forEach((name, k) => {
    if (!(FACTORS as readonly unknown[]).includes(name))
      throw new InputError(`freeFactors.${k}`, name, `must be one of ${FACTORS.join(', ')}`);
    out[name as RelativityFactorName] = true;
  });
  return out;
}

function checkSampler(s: SamplerOptions): Required<SamplerOptions> {
  if (typeof s !== 'object' || s === null)
    throw new InputError(
      'posterior',
      s,
      'must be an object { seed, ensembleSize?, rounds?, discardRounds? }',
    );
  const seed = requireFinite('posterior.seed', s.seed);
  if (!Number.isInteger(seed)) throw new InputError('posterior.seed', seed, 'must be an integer');
  const rounds = s.rounds ?? 2000;
  if (!Number.isInteger(rounds) || rounds < 100 || rounds > 100_000)
    throw new InputError('posterior.rounds', rounds, 'must be an integer from 100 to 100000');
  const discardRounds = s.discardRounds ?? Math.floor(rounds / 2);
  if (!Number.isInteger(discardRounds) || discardRounds < 0 || discardRounds > 100_000)
    throw new InputError(
      'posterior.discardRounds',
      discardRounds,
      'must be an integer from 0 to 100000',
    );
  const ensembleSize = s.ensembleSize ?? 0; // 0: chosen from the number of free parameters
  if (
    !Number.isInteger(ensembleSize) ||
    ensembleSize < 0 ||
    ensembleSize > 1000 ||
    ensembleSize % 2 !== 0
  )
    throw new InputError(
      'posterior.ensembleSize',
      ensembleSize,
      'must be an even integer up to 1000',
    );
  return { seed, rounds, discardRounds, ensembleSize };
}
