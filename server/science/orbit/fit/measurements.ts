/**
 * Measurements checked and brought to internal units (JD, mas, rad, km/s). Every rule names the
 * field by its dotted path in the request, so the HTTP and CLI layers can show it as it is.
 */
import { DEG } from '../../constants.ts';
import { InputError, requireFinite } from '../../errors.ts';
import { parseEpoch } from '../../time/index.ts';
import type { MeasurementInput } from './types.ts';

export type ObsKind = 'offsets' | 'separation' | 'radial-velocity';

/** One measurement in internal units. Components: offset [Δα*, Δδ] mas; separation [ρ mas, θ rad]; rv [v km/s]. */
export interface Observation {
  kind: ObsKind;
  index: number;
  id: string | undefined;
  jd: number;
  value: [number, number];
  sigma: [number, number];
  /** Correlation of the two components (offsets only). */
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

/** Check one star's measurements. @throws InputError naming `${prefix}.<k>.<field>` */
export function readMeasurements(list: unknown, prefix: string): Observation[] {
  if (!Array.isArray(list)) throw new InputError(prefix, list, 'must be a list of measurements');
  return list.map((raw: unknown, k): Observation => {
    const p = `${prefix}.${k}`;
    if (typeof raw !== 'object' || raw === null) throw new InputError(p, raw, 'must be an object');
    const m = raw as Record<string, unknown>;
    const id = m.id === undefined ? undefined : String(m.id);
    const jd = epochOf(`${p}.epoch`, m.epoch);
    const kind = m.kind as MeasurementInput['kind'] | undefined;
    switch (kind) {
      case 'offsets': {
        const rho =
          m.correlation === undefined ? 0 : requireFinite(`${p}.correlation`, m.correlation);
        if (!(rho > -1 && rho < 1))
          throw new InputError(`${p}.correlation`, rho, 'must satisfy −1 < ρ < 1');
        return {
          kind,
          index: k,
          id,
          jd,
          rho,
          value: [requireFinite(`${p}.dRaMas`, m.dRaMas), requireFinite(`${p}.dDecMas`, m.dDecMas)],
          sigma: [
            positive(`${p}.sigmaDRaMas`, m.sigmaDRaMas),
            positive(`${p}.sigmaDDecMas`, m.sigmaDDecMas),
          ],
        };
      }
      case 'separation': {
        const sep = requireFinite(`${p}.separationMas`, m.separationMas);
        if (!(sep >= 0)) throw new InputError(`${p}.separationMas`, sep, 'must be ≥ 0');
        return {
          kind,
          index: k,
          id,
          jd,
          rho: 0,
          value: [sep, requireFinite(`${p}.positionAngleDeg`, m.positionAngleDeg) * DEG],
          sigma: [
            positive(`${p}.sigmaSeparationMas`, m.sigmaSeparationMas),
            positive(`${p}.sigmaPositionAngleDeg`, m.sigmaPositionAngleDeg) * DEG,
          ],
        };
      }
      case 'radial-velocity':
        return {
          kind,
          index: k,
          id,
          jd,
          rho: 0,
          value: [requireFinite(`${p}.radialVelocityKmS`, m.radialVelocityKmS), 0],
          sigma: [positive(`${p}.sigmaRadialVelocityKmS`, m.sigmaRadialVelocityKmS), 1],
        };
      default:
        throw new InputError(
          `${p}.kind`,
          m.kind,
          'must be "offsets", "separation" or "radial-velocity"',
        );
    }
  });
}

/** Number of residual components a measurement contributes. */
export function componentCount(o: Observation): number {
  return o.kind === 'radial-velocity' ? 1 : 2;
}
