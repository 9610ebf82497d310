/**
 * Measurements checked and brought to internal units (JD, mas, rad, km/s). Every rule names the
 * field by its dotted path in the request, so the HTTP and CLI layers can show it as it is.
 */
import { DEG } from '../../constants.ts';
import { InputError, requireFinite } from '../../errors.ts';
import { parseEpoch } from '../../time/index.ts';
import {
  MEASUREMENT_KIND_NAMES,
  componentCount as kindComponents,
  defaultComponent,
  describeKind,
  type MeasuredComponent,
  type MeasuredValue,
  type MeasurementKind,
} from '../../../../descriptors/measurement-kinds.ts';

/** One measurement in internal units. Components: offset [Δα*, Δδ] mas; separation [ρ mas, θ rad]; rv [v km/s]. */
export interface Observation {
  kind: MeasurementKind;
  /** Which body it is of (descriptors/measurement-kinds.ts). */
  component: MeasuredComponent;
  index: number;
  id: string | undefined;
  jd: number;
  /** The kind's values in its descriptor's order; a one-value kind is padded with 0 (σ 1). */
  value: [number, number];
  sigma: [number, number];
  /** Correlation of the two components' errors (0 for a kind without one). */
  rho: number;
}

function positive(field: string, v: unknown): number {
  const x = requireFinite(field, v);
  if (!(x > 0)) throw new InputError(field, v, 'must be greater than 0 (an uncertainty)');
  return x;
}

function epochOf(field: string, v: unknown): number {
  if (typeof v === 'number') {
    requireFinite(field, v);
    return v;
  }
  return parseEpoch(v, field);
}

/** A value in internal units (degrees to radians), within its descriptor's bounds. */
function readValue(p: string, m: Record<string, unknown>, v: MeasuredValue): [number, number] {
  const x = requireFinite(`${p}.${v.field}`, m[v.field]);
  if (v.min !== undefined && !(x >= v.min))
    throw new InputError(`${p}.${v.field}`, x, `must be ≥ ${v.min}`);
  if (v.below !== undefined && !(x < v.below))
    throw new InputError(`${p}.${v.field}`, x, `must be < ${v.below}`);
  if (v.max !== undefined && !(x <= v.max))
    throw new InputError(`${p}.${v.field}`, x, `must be ≤ ${v.max}`);
  const scale = v.unit === 'deg' ? DEG : 1;
  return [x * scale, positive(`${p}.${v.sigma}`, m[v.sigma]) * scale];
}

function correlationOf(p: string, m: Record<string, unknown>, kind: MeasurementKind): number {
  if (!describeKind(kind).correlated || m.correlation === undefined) return 0;
  const rho = requireFinite(`${p}.correlation`, m.correlation);
  if (!(rho > -1 && rho < 1))
    throw new InputError(`${p}.correlation`, rho, 'must satisfy −1 < ρ < 1');
  return rho;
}

function componentOf(
  p: string,
  m: Record<string, unknown>,
  kind: MeasurementKind,
): MeasuredComponent {
  if (m.component === undefined) return defaultComponent(kind);
  const allowed: readonly unknown[] = describeKind(kind).components;
  if (!allowed.includes(m.component))
    throw new InputError(
      `${p}.component`,
      m.component,
      `must be ${allowed.map((c) => JSON.stringify(c)).join(', ')} for kind "${kind}"${
        describeKind(kind).blockKind === 'astrometry'
          ? ' (a position is of the secondary relative to the primary, or offsets of the unresolved pair’s photocentre)'
          : ''
      }`,
    );
  return m.component as MeasuredComponent;
}

const KIND_RULE = `must be ${MEASUREMENT_KIND_NAMES.map((k) => JSON.stringify(k))
  .join(', ')
  .replace(/, ([^,]*)$/, ' or $1')}`;

/** Check one star's measurements. @throws InputError naming `${prefix}.<k>.<field>` */
export function readMeasurements(list: unknown, prefix: string): Observation[] {
  if (!Array.isArray(list)) throw new InputError(prefix, list, 'must be a list of measurements');
  return list.map((raw: unknown, k): Observation => {
    const p = `${prefix}.${k}`;
    if (typeof raw !== 'object' || raw === null) throw new InputError(p, raw, 'must be an object');
    const m = raw as Record<string, unknown>;
    const id = m.id === undefined ? undefined : String(m.id);
    const jd = epochOf(`${p}.epoch`, m.epoch);
    const kind = m.kind as MeasurementKind;
    if (!(MEASUREMENT_KIND_NAMES as readonly unknown[]).includes(kind))
      throw new InputError(`${p}.kind`, m.kind, KIND_RULE);
    const component = componentOf(p, m, kind);
    const rho = correlationOf(p, m, kind);
    const [first, second] = describeKind(kind).values.map((v) => readValue(p, m, v));
    const [v1, s1] = first!;
    const [v2, s2] = second ?? [0, 1];
    return { kind, component, index: k, id, jd, rho, value: [v1, v2], sigma: [s1, s2] };
  });
}

/** Number of residual components a measurement contributes. */
export function componentCount(o: Observation): number {
  return kindComponents(o.kind);
}

/**
 * The first and last of some epochs (JD), by a loop: spreading 10⁵ values into Math.min/max
 * overflows the call stack, and fits take up to 200,000 measurements.
 */
export function epochExtent(jd: Iterable<number>): { first: number; last: number } {
  let first = Infinity,
    last = -Infinity;
  for (const t of jd) {
    if (t < first) first = t;
    if (t > last) last = t;
  }
  return { first, last };
}
