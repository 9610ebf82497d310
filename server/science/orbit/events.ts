/**
 * Events of an orbit in an interval: periapsis and apoapsis passages, node passages, radial-velocity
 * extrema, closest and widest projected separation, each with the predicted state at that instant.
 *
 * Every orbit k is parametrised by its eccentric anomaly E ∈ [−π, π) around periapsis k, so the
 * emission time t_em = T + kP + (E − e·sin E)/n needs no Kepler solve and samples crowd near
 * periapsis, where eccentric orbits change fastest. Observed times add the Rømer delay when it is on
 * (monotonic in E because |v_z| < c). Nodes are roots of the line-of-sight position (so they need a
 * distance) or, without one, of the Keplerian sign of sin(ν + ω); extrema come from sampling then a
 * golden-section refinement.
 */
import { ComputationError, InputError } from '../errors.ts';
import { jdToIso } from '../time/index.ts';
import {
  allocateColumns,
  observedTime,
  prepare,
  rowOf,
  writeState,
  type Prediction,
  type PredictionColumns,
  type Prepared,
} from './predict.ts';
import type { Orbit } from './types.ts';

export const EVENT_KINDS = [
  'periapsis',
  'apoapsis',
  'ascending-node',
  'descending-node',
  'rv-maximum',
  'rv-minimum',
  'closest-separation',
  'widest-separation',
] as const;
export type EventKind = (typeof EVENT_KINDS)[number];

export interface OrbitEvent {
  kind: EventKind;
  /** Observed instant, JD (UTC) and ISO 8601. */
  jd: number;
  epoch: string;
  /** Whether `epoch` includes the light-time across the orbit (the Rømer delay is on). */
  lightTimeIncluded: boolean;
  /** When the light left the star (equal to `epoch` without the Rømer delay), ISO 8601 UTC. */
  emissionEpoch: string;
  /** Orbit count: 0 is the orbit whose periapsis is the elements' T. */
  orbitNumber: number;
  state: Prediction;
}

/** Where an event sits: orbit k, eccentric anomaly E (rad). */
export interface EventLocus {
  kind: EventKind;
  k: number;
  E: number;
}

const SAMPLES_PER_ORBIT = 360;
const MAX_ORBITS = 20_000;
const GOLDEN = (Math.sqrt(5) - 1) / 2;

/** Evaluates states at (k, E) into a one-row buffer. */
export class OrbitSampler {
  readonly p: Prepared;
  private readonly row: PredictionColumns = allocateColumns(1);
  constructor(orbit: Orbit) {
    this.p = prepare(orbit);
  }
  emissionTime(k: number, E: number): number {
    const o = this.p.orbit;
    return o.periapsisJd + k * o.periodDays + (E - o.e * Math.sin(E)) / this.p.n;
  }
  /** Fill the buffer with the state at (k, E) and return it. */
  at(k: number, E: number): PredictionColumns {
    const tEm = this.emissionTime(k, E);
    writeState(this.p, observedTime(this.p, tEm, E), tEm, E, this.row, 0);
    return this.row;
  }
  observed(k: number, E: number): number {
    return observedTime(this.p, this.emissionTime(k, E), E);
  }
  state(k: number, E: number): Prediction {
    return rowOf(this.at(k, E), 0, this.p.orbit.relativity.romer);
  }
}

type Scalar = (k: number, E: number) => number;

function nodeFunction(s: OrbitSampler): Scalar {
  if (s.p.orbit.distancePc !== null) return (k, E) => s.at(k, E).lineOfSightAu[0]!;
  // Without a distance the line-of-sight position is known up to the scale: sin i·(X sin ω + Y cos ω).
  return (k, E) => {
    const c = s.at(k, E);
    const nu = (c.trueAnomalyDeg[0]! * Math.PI) / 180;
    return Math.sin(nu + s.p.orbit.argRad) * s.p.si;
  };
}

function bisect(f: Scalar, k: number, lo: number, hi: number, flo: number): number {
  for (let it = 0; it < 80 && hi - lo > 1e-14; it++) {
    const mid = 0.5 * (lo + hi);
    const fm = f(k, mid);
    if (fm === 0) return mid;
    if (fm > 0 === flo > 0) {
      lo = mid;
      flo = fm;
    } else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Golden-section search for the maximum of sign·f on [lo, hi]. */
function golden(f: Scalar, k: number, lo: number, hi: number, sign: number): number {
  let x1 = hi - GOLDEN * (hi - lo);
  let x2 = lo + GOLDEN * (hi - lo);
  let f1 = sign * f(k, x1);
  let f2 = sign * f(k, x2);
  for (let it = 0; it < 100 && hi - lo > 1e-11; it++) {
    if (f1 < f2) {
      lo = x1;
      x1 = x2;
      f1 = f2;
      x2 = lo + GOLDEN * (hi - lo);
      f2 = sign * f(k, x2);
    } else {
      hi = x2;
      x2 = x1;
      f2 = f1;
      x1 = hi - GOLDEN * (hi - lo);
      f1 = sign * f(k, x1);
    }
  }
  return 0.5 * (lo + hi);
}

/** Every event of the requested kinds in orbit k, as (kind, k, E), E ∈ [−π, π). */
export function eventsInOrbit(
  s: OrbitSampler,
  k: number,
  kinds: ReadonlySet<EventKind>,
): EventLocus[] {
  const out: EventLocus[] = [];
  if (kinds.has('periapsis')) out.push({ kind: 'periapsis', k, E: 0 });
  if (kinds.has('apoapsis')) out.push({ kind: 'apoapsis', k, E: -Math.PI });
  const h = (2 * Math.PI) / SAMPLES_PER_ORBIT;
  const grid = (f: Scalar) => {
    const v = new Float64Array(SAMPLES_PER_ORBIT + 2);
    for (let j = -1; j < SAMPLES_PER_ORBIT; j++) v[j + 1] = f(k, -Math.PI + j * h);
    // The seam E = π of orbit k is E = −π of orbit k + 1: take that value, so that a root on the
    // seam falls in exactly one orbit whatever the rounding of sin(±π).
    v[SAMPLES_PER_ORBIT + 1] = f(k + 1, -Math.PI);
    return v;
  };
  if (kinds.has('ascending-node') || kinds.has('descending-node')) {
    const f = nodeFunction(s);
    const v = grid(f);
    for (let j = 0; j < SAMPLES_PER_ORBIT; j++) {
      const prev = v[j]!,
        a = v[j + 1]!,
        b = v[j + 2]!;
      if (a === 0) {
        // A root exactly on a sample (e.g. ω = 0 puts the node at E = 0).
        if (prev !== 0 && b !== 0 && prev > 0 !== b > 0) {
          const kind: EventKind = b > prev ? 'ascending-node' : 'descending-node';
          if (kinds.has(kind)) out.push({ kind, k, E: -Math.PI + j * h });
        }
        continue;
      }
      if (b === 0 || a > 0 === b > 0) continue;
      const kind: EventKind = b > a ? 'ascending-node' : 'descending-node';
      if (!kinds.has(kind)) continue;
      out.push({ kind, k, E: bisect(f, k, -Math.PI + j * h, -Math.PI + (j + 1) * h, a) });
    }
  }
  const extrema = (f: Scalar, maxKind: EventKind, minKind: EventKind) => {
    if (!kinds.has(maxKind) && !kinds.has(minKind)) return;
    const v = grid(f);
    let lo = Infinity,
      hi = -Infinity;
    for (const x of v) {
      lo = Math.min(lo, x);
      hi = Math.max(hi, x);
    }
    if (!(hi - lo > 1e-9 * Math.max(Math.abs(hi), Math.abs(lo), 1e-300))) return; // flat: no extremum to speak of
    for (let j = 0; j < SAMPLES_PER_ORBIT; j++) {
      const a = v[j]!,
        b = v[j + 1]!,
        c = v[j + 2]!;
      const E0 = -Math.PI + j * h;
      if (b >= a && b > c && kinds.has(maxKind))
        out.push(seamed(maxKind, k, golden(f, k, E0 - h, E0 + h, 1)));
      if (b <= a && b < c && kinds.has(minKind))
        out.push(seamed(minKind, k, golden(f, k, E0 - h, E0 + h, -1)));
    }
  };
  if (s.p.orbit.distancePc !== null)
    extrema((kk, E) => s.at(kk, E).radialVelocityKmS[0]!, 'rv-maximum', 'rv-minimum');
  extrema((kk, E) => s.at(kk, E).separationMas[0]!, 'widest-separation', 'closest-separation');
  return out;
}

/** A refinement may step over the seam at E = ±π: carry it into the neighbouring orbit. */
function seamed(kind: EventKind, k: number, E: number): EventLocus {
  if (E >= Math.PI) return { kind, k: k + 1, E: E - 2 * Math.PI };
  if (E < -Math.PI) return { kind, k: k - 1, E: E + 2 * Math.PI };
  return { kind, k, E };
}

/** An angle difference brought into [−π, π). */
function wrap(E: number): number {
  return E >= Math.PI ? E - 2 * Math.PI : E < -Math.PI ? E + 2 * Math.PI : E;
}

export interface EventOptions {
  /** Which kinds to find (default: all that the orbit supports). */
  kinds?: readonly EventKind[];
}

/**
 * All events of the requested kinds whose observed time lies in [startJd, endJd], soonest first.
 * RV extrema need a distance (they are skipped without one).
 * @throws InputError when the interval is reversed or spans more than 20 000 orbits
 */
export function findEventLoci(
  orbit: Orbit,
  startJd: number,
  endJd: number,
  options: EventOptions = {},
): { sampler: OrbitSampler; loci: EventLocus[] } {
  if (!(endJd > startJd)) throw new InputError('end', endJd, `must be after start (${startJd})`);
  const kinds = new Set<EventKind>(options.kinds ?? EVENT_KINDS);
  for (const k of kinds)
    if (!(EVENT_KINDS as readonly string[]).includes(k))
      throw new InputError('kinds', k, `must be one of ${EVENT_KINDS.join(', ')}`);
  const P = orbit.periodDays;
  // Light time can move an event by up to a·(1+e)/c: widen the search by a period each side.
  const k0 = Math.floor((startJd - orbit.periapsisJd) / P) - 1;
  const k1 = Math.ceil((endJd - orbit.periapsisJd) / P) + 1;
  if (k1 - k0 > MAX_ORBITS)
    throw new InputError(
      'end',
      endJd,
      `spans ${k1 - k0} orbits; at most ${MAX_ORBITS} per request`,
    );
  const sampler = new OrbitSampler(orbit);
  const loci: { l: EventLocus; t: number }[] = [];
  for (let k = k0; k <= k1; k++) {
    for (const l of eventsInOrbit(sampler, k, kinds)) {
      const t = sampler.observed(l.k, l.E);
      if (t >= startJd && t <= endJd) loci.push({ l, t });
    }
  }
  loci.sort((a, b) => a.t - b.t);
  return { sampler, loci: loci.map((x) => x.l) };
}

/** The events as objects with their states (see findEventLoci). */
export function findEvents(
  orbit: Orbit,
  startJd: number,
  endJd: number,
  options: EventOptions = {},
): OrbitEvent[] {
  const { sampler, loci } = findEventLoci(orbit, startJd, endJd, options);
  return loci.map((l) => eventFromLocus(sampler, l));
}

export function eventFromLocus(s: OrbitSampler, l: EventLocus): OrbitEvent {
  const state = s.state(l.k, l.E);
  return {
    kind: l.kind,
    jd: state.jd,
    epoch: jdToIso(state.jd),
    lightTimeIncluded: state.lightTimeIncluded,
    emissionEpoch: state.emissionEpoch,
    orbitNumber: l.k,
    state,
  };
}

/**
 * The same event (kind, orbit k) on a perturbed orbit: the one of that kind in orbit k nearest in E
 * to where it was. Returns its observed JD, or null when the perturbed orbit has no such event.
 */
export function relocateEvent(orbit: Orbit, locus: EventLocus): number | null {
  const s = new OrbitSampler(orbit);
  if (locus.kind === 'periapsis' || locus.kind === 'apoapsis') return s.observed(locus.k, locus.E);
  const found = eventsInOrbit(s, locus.k, new Set([locus.kind]));
  if (found.length === 0) return null;
  let best = found[0]!;
  const dist = (E: number) => Math.abs(wrap(E - locus.E));
  for (const f of found) if (dist(f.E) < dist(best.E)) best = f;
  return s.observed(best.k, best.E);
}

/** The next periapsis passage at or after jd (observed time). */
export function nextPeriapsis(orbit: Orbit, jd: number): OrbitEvent {
  const { sampler, loci } = findEventLoci(orbit, jd, jd + orbit.periodDays * 1.0000001 + 1, {
    kinds: ['periapsis'],
  });
  const first = loci[0];
  if (!first) throw new ComputationError('no periapsis found within one period');
  return eventFromLocus(sampler, first);
}
