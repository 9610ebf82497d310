/**
 * Detection forecast of the relativistic terms: for a target's current orbit, its measurements and
 * a plan of epochs, the Fisher σ of the redshift and precession factors now and after the plan, the
 * first planned epoch after which each factor's expected significance (its value over σ; 1 under
 * general relativity) reaches 3σ and 5σ, and the planned epochs that contribute most. Linear:
 * it is what refits of such data would report (checked against simulated refits in the tests).
 */
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { fisherRows } from '../orbit/fit/fisher.ts';
import type { MeasurementInput, RelativityFactorName } from '../orbit/fit/types.ts';
import type { Orbit } from '../orbit/index.ts';
import { jdToIso } from '../time/index.ts';
import type { BlockKind } from './candidates.ts';
import type { Precision } from './information.ts';

export const FORECAST_FACTORS: readonly RelativityFactorName[] = [
  'redshiftFactor',
  'precessionFactor',
];
export const DETECTION_THRESHOLDS = [3, 5] as const;
const TOP_EPOCHS = 5;

/** One planned measurement: when (JD), which kind, and its 1σ (default: the request's precision). */
export interface ForecastEpoch {
  jd: number;
  kind: BlockKind;
  /** mas per offset component (astrometry) or km/s (spectroscopy). */
  sigma?: number;
}

export interface ForecastRequest {
  /** The current solution, with a distance. */
  orbit: Orbit;
  /** The measurements that exist (their epochs, kinds and σ count; values are not used). */
  measurements: MeasurementInput[];
  plan: ForecastEpoch[];
  precision: Precision;
}

export interface FactorForecast {
  name: RelativityFactorName;
  /** The value assumed true: the orbit's factor (1 is general relativity). */
  assumedValue: number;
  /** Fisher 1σ from the measurements alone, and with the plan; null when not yet determined. */
  sigmaNow: number | null;
  sigmaAfter: number | null;
  /** Expected significance |value|/σ of the detection, now and after the plan (0 when undetermined). */
  significanceNow: number;
  significanceAfter: number;
  /** For 3σ and 5σ: reached already, or after the planned epoch given (observed time, ISO 8601), or not. */
  reaches: { sigma: number; already: boolean; epoch: string | null }[];
  /** The planned epochs that add most to the factor's information, largest first. */
  topEpochs: { epoch: string; kind: BlockKind; share: number }[];
}

export interface DetectionForecast {
  factors: FactorForecast[];
  plannedEpochs: number;
  /** One line per factor, for flags and screens. */
  summary: string[];
  assumptions: string;
}

const LABEL: Record<RelativityFactorName, string> = {
  redshiftFactor: 'redshift',
  precessionFactor: 'precession',
};

/** Planned epochs as measurements of the fit's kinds (values are placeholders: only σ counts). */
/** A planned epoch as the Fisher rows read it: a measurement of value 0 with the epoch's σ. */
export function plannedMeasurement(e: ForecastEpoch, p: Precision): MeasurementInput {
  if (e.kind === 'spectroscopy')
    return {
      kind: 'radial-velocity',
      epoch: e.jd,
      radialVelocityKmS: 0,
      sigmaRadialVelocityKmS: e.sigma ?? p.spectroscopyKmS,
    };
  const s = e.sigma ?? p.astrometryMas;
  return { kind: 'offsets', epoch: e.jd, dRaMas: 0, dDecMas: 0, sigmaDRaMas: s, sigmaDDecMas: s };
}

function addRows(F: Float64Array, rows: Float64Array[], n: number, sign = 1): void {
  for (const r of rows)
    for (let i = 0; i < n; i++) {
      const ri = r[i]!;
      if (ri === 0) continue;
      for (let j = 0; j < n; j++) F[i * n + j] = F[i * n + j]! + sign * ri * r[j]!;
    }
}

/** σ of the parameters `which` from information F (n×n), or null where F is singular. */
function sigmasOf(F: Float64Array, n: number, which: number[]): (number | null)[] {
  const d = Array.from({ length: n }, (_, i) => Math.sqrt(F[i * n + i]!));
  if (d.some((x) => !(x > 0))) return which.map(() => null);
  const scaled = new Matrix(n, n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) scaled.set(i, j, F[i * n + j]! / (d[i]! * d[j]!));
  const chol = new CholeskyDecomposition(scaled);
  if (!chol.isPositiveDefinite()) return which.map(() => null);
  const inv = chol.solve(Matrix.eye(n));
  return which.map((k) => {
    const v = inv.get(k, k);
    // A condition beyond ~1e12 means the direction is not determined, whatever the arithmetic says.
    return v > 0 && v < 1e12 ? Math.sqrt(v) / d[k]! : null;
  });
}

/**
 * The detection forecast of both factors.
 * @throws InputError when the orbit has no distance or a measurement or epoch is malformed
 */
export function forecastDetection(req: ForecastRequest): DetectionForecast {
  const plan = [...req.plan].sort((a, b) => a.jd - b.jd);
  const all = [...req.measurements, ...plan.map((e) => plannedMeasurement(e, req.precision))];
  const fisher = fisherRows(req.orbit, all, [...FORECAST_FACTORS]);
  const n = fisher.parameters.length;
  const idx = FORECAST_FACTORS.map((f) => fisher.parameters.indexOf(f));
  const now = new Float64Array(n * n);
  for (let k = 0; k < req.measurements.length; k++) addRows(now, fisher.rows[k]!, n);
  const sigmaNow = sigmasOf(now, n, idx);
  const running = Float64Array.from(now);
  const after: (number | null)[][] = [];
  plan.forEach((_, k) => {
    addRows(running, fisher.rows[req.measurements.length + k]!, n);
    after.push(sigmasOf(running, n, idx));
  });
  const sigmaAfter = plan.length ? after[after.length - 1]! : sigmaNow;
  const leaveOut = plan.map((_, k) => {
    const F = Float64Array.from(running);
    addRows(F, fisher.rows[req.measurements.length + k]!, n, -1);
    return sigmasOf(F, n, idx);
  });
  const factors = FORECAST_FACTORS.map((name, q): FactorForecast => {
    const value = req.orbit.factors[name];
    const signif = (s: number | null) => (s === null ? 0 : Math.abs(value) / s);
    const infoAll = sigmaAfter[q] ? 1 / sigmaAfter[q]! ** 2 : 0;
    const topEpochs = plan
      .map((e, k) => {
        const s = leaveOut[k]![q];
        const without = s ? 1 / s ** 2 : 0;
        return {
          epoch: jdToIso(e.jd),
          kind: e.kind,
          share: infoAll > 0 ? (infoAll - without) / infoAll : 0,
        };
      })
      .sort((a, b) => b.share - a.share)
      .slice(0, TOP_EPOCHS);
    return {
      name,
      assumedValue: value,
      sigmaNow: sigmaNow[q]!,
      sigmaAfter: sigmaAfter[q]!,
      significanceNow: signif(sigmaNow[q]!),
      significanceAfter: signif(sigmaAfter[q]!),
      reaches: DETECTION_THRESHOLDS.map((t) => {
        const already = signif(sigmaNow[q]!) >= t;
        const k = already ? -1 : after.findIndex((s) => signif(s[q]!) >= t);
        return { sigma: t, already, epoch: k >= 0 ? jdToIso(plan[k]!.jd) : null };
      }),
      topEpochs,
    };
  });
  return {
    factors,
    plannedEpochs: plan.length,
    summary: factors.map(summaryLine),
    assumptions:
      'linear (Fisher) forecast at the current solution, with every orbital element, the distance ' +
      'and γ free; a factor is assumed to have its solution value (1: general relativity)',
  };
}

function summaryLine(f: FactorForecast): string {
  const what = LABEL[f.name];
  const now = f.sigmaNow === null ? 'not determined yet' : `${f.significanceNow.toFixed(1)}σ now`;
  const five = f.reaches.find((r) => r.sigma === 5)!;
  const three = f.reaches.find((r) => r.sigma === 3)!;
  const day = (iso: string) => iso.slice(0, 10);
  if (five.already) return `${what} detected at 5σ already (${now})`;
  if (five.epoch) return `${what} detectable at 5σ after the ${day(five.epoch)} epochs (${now})`;
  if (three.already || three.epoch)
    return (
      `${what} reaches 3σ ` +
      `${three.already ? 'already' : `after the ${day(three.epoch!)} epochs`}, ` +
      `${f.significanceAfter.toFixed(1)}σ after the plan (${now})`
    );
  return `${what} not detectable with this plan: ${f.significanceAfter.toFixed(1)}σ after it (${now})`;
}
