/**
 * The forward model of a fit and its analytic derivatives.
 *
 * Values come from the engine's own predictions (predict.ts), so a fitted orbit predicts exactly
 * what it was fitted with. Derivatives of the Keplerian part are analytic, by the chain rule
 * through Kepler's equation (∂E/∂M = 1/(1 − e cos E), ∂E/∂e = sin E/(1 − e cos E)) and the
 * Thiele–Innes constants. Switched-on relativistic terms are a small correction
 * (full − Keplerian model) whose derivatives are taken by central differences.
 */
import { componentCount } from './measurements.ts';
import { AU_KM, DEG, JULIAN_YEAR_DAYS, SECONDS_PER_DAY, TWO_PI } from '../../constants.ts';
import { predictBatch } from '../predict.ts';
import type { RelativitySwitches } from '../types.ts';
import { photocentreShare, velocityShare } from '../physical.ts';
import { type Layout, starOrbit } from './layout.ts';

const NO_RELATIVITY: RelativitySwitches = {
  romer: false,
  gravitationalRedshift: false,
  transverseDoppler: false,
  precession: false,
};
/** km/s per (pc · mas/day): a[au] = a[mas]·d[pc]/1000. */
const KAPPA = AU_KM / SECONDS_PER_DAY / 1000;

export interface ModelOutput {
  /** Raw model components per residual component: Δα*, Δδ (mas) / ρ (mas), θ (rad) / v (km/s). */
  values: Float64Array;
  /** ∂values/∂θ for every parameter, row-major (components × parameters); absent when not asked. */
  deriv: Float64Array | null;
}

function anyOn(r: RelativitySwitches): boolean {
  return r.romer || r.gravitationalRedshift || r.transverseDoppler || r.precession;
}

/** The model at theta (internal units), with the Jacobian when `withDeriv`. */
export function evaluateModel(L: Layout, theta: Float64Array, withDeriv: boolean): ModelOutput {
  if (!anyOn(L.relativity)) return keplerianModel(L, theta, withDeriv, 'own');
  const values = keplerianModel(L, theta, false, 'own').values;
  if (!withDeriv) return { values, deriv: null };
  // Keplerian part analytic; J += ∂(full − Keplerian)/∂θ by central differences.
  const deriv = keplerianModel(L, theta, true, 'none').deriv!;
  const np = L.params.length,
    nc = L.components;
  const angles = angleComponents(L);
  const correction = (t: Float64Array) => {
    const f = keplerianModel(L, t, false, 'own').values,
      k = keplerianModel(L, t, false, 'none').values;
    for (let c = 0; c < nc; c++)
      f[c] = angles[c]
        ? Math.atan2(Math.sin(f[c]! - k[c]!), Math.cos(f[c]! - k[c]!))
        : f[c]! - k[c]!;
    return f;
  };
  for (let j = 0; j < np; j++) {
    const h = stepFor(L, theta, j);
    const tp = Float64Array.from(theta),
      tm = Float64Array.from(theta);
    tp[j] = theta[j]! + h;
    tm[j] = theta[j]! - h;
    const dp = correction(tp),
      dm = correction(tm);
    for (let c = 0; c < nc; c++)
      deriv[c * np + j] = deriv[c * np + j]! + (dp[c]! - dm[c]!) / (2 * h);
  }
  return { values, deriv };
}

/** A finite-difference step for parameter j, in internal units. */
export function stepFor(L: Layout, theta: ArrayLike<number>, j: number): number {
  const p = L.params[j]!;
  switch (p.key) {
    case 'periodYears':
      return theta[j]! * 1e-7;
    case 'periapsisDays':
      return theta[L.stars[p.star!]!.slots.P]! * 1e-7;
    case 'eccentricity':
      return 1e-7;
    case 'inclinationDeg':
    case 'ascendingNodeDeg':
    case 'argPeriapsisDeg':
      return 1e-7;
    default:
      return Math.max(Math.abs(theta[j]!) * 1e-7, 1e-7);
  }
}

/** 1 where residual component c is a position angle (rad, wraps), else 0. */
export function angleComponents(L: Layout): Uint8Array {
  const mask = new Uint8Array(L.components);
  for (const s of L.stars) {
    let c = s.firstComponent;
    for (const m of s.obs) {
      if (m.kind === 'separation') mask[c + 1] = 1;
      c += componentCount(m);
    }
  }
  return mask;
}

/**
 * The model with each star's own relativistic terms ('own') or none; Keplerian derivatives when
 * asked.
 */
export function keplerianModel(
  L: Layout,
  theta: Float64Array,
  withDeriv: boolean,
  relativity: 'own' | 'none',
): ModelOutput {
  // Hot kernel (every LM evaluation, every row): one pass per star and measurement, with the
  // analytic Jacobian written beside each value. Steps: 1. per star, its orbit, one batch
  // prediction and the Campbell orientation constants; 2. per measurement, the model value
  // (velocity share, photocentre scale, frame terms; offsets or separation and angle); 3. with
  // derivatives, ∂/∂(P, T, e) through Kepler's equation, then ∂/∂(A, B, F, G) or ∂/∂(a, i, Ω, ω),
  // the photocentre, frame and velocity terms; 4. the row's gradient(s) into the Jacobian
  // (separation and angle by the chain rule from Δα*, Δδ).
  const np = L.params.length;
  const values = new Float64Array(L.components);
  const deriv = withDeriv ? new Float64Array(L.components * np) : null;
  const { sys } = L;
  const x0 = sys.x0 >= 0 ? theta[sys.x0]! : 0,
    y0 = sys.y0 >= 0 ? theta[sys.y0]! : 0;
  const vx = sys.vx >= 0 ? theta[sys.vx]! : 0,
    vy = sys.vy >= 0 ? theta[sys.vy]! : 0;
  const gx = new Float64Array(np),
    gy = new Float64Array(np),
    gv = new Float64Array(np);
  for (let k = 0; k < L.stars.length; k++) {
    const star = L.stars[k]!;
    const orbit = starOrbit(L, theta, k, relativity === 'own' ? star.relativity : NO_RELATIVITY);
    const cols = predictBatch(orbit, star.jd);
    const s = star.slots;
    const P = orbit.periodDays,
      T = orbit.periapsisJd,
      e = orbit.e,
      a = orbit.aMas;
    const sq = Math.sqrt(1 - e * e),
      n = TWO_PI / P;
    // 1. (With the orbit and batch prediction above) the Campbell orientation constants, mas.
    const ci = Math.cos(orbit.iRad),
      si = Math.sin(orbit.iRad);
    const cn = Math.cos(orbit.nodeRad),
      sn = Math.sin(orbit.nodeRad);
    const cw = Math.cos(orbit.argRad),
      sw = Math.sin(orbit.argRad);
    const A = a * (cw * cn - sw * sn * ci),
      B = a * (cw * sn + sw * cn * ci);
    const F = a * (-sw * cn - cw * sn * ci),
      G = a * (-sw * sn + cw * cn * ci);
    const C = a * si * sw,
      H = a * si * cw;
    const d = orbit.distancePc ?? 0;
    const massRatio = s.q >= 0 ? theta[s.q]! : 0;
    const light = photocentreShare(massRatio, s.beta >= 0 ? theta[s.beta]! : 0);
    const gamma = orbit.gammaKmS;
    let row = star.firstComponent;
    for (let m = 0; m < star.obs.length; m++) {
      // 2. The model value of this measurement.
      const ob = star.obs[m]!;
      const tau = (ob.jd - L.frameEpochJd) / JULIAN_YEAR_DAYS;
      const [share, dShare] = velocityShare(ob.component, massRatio);
      if (ob.kind === 'radial-velocity') {
        values[row] = gamma + share * (cols.radialVelocityKmS[m]! - gamma);
      } else {
        // The photocentre moves as (β − B) times the relative orbit.
        const scale = ob.component === 'photocentre' ? light.share : 1;
        const x = scale * cols.dRaMas[m]! + x0 + vx * tau,
          y = scale * cols.dDecMas[m]! + y0 + vy * tau;
        if (ob.kind === 'offsets') {
          values[row] = x;
          values[row + 1] = y;
        } else {
          values[row] = Math.hypot(x, y);
          values[row + 1] = Math.atan2(x, y);
        }
      }
      // 3. Its gradient over every parameter.
      if (deriv) {
        gx.fill(0);
        gy.fill(0);
        gv.fill(0);
        const E = cols.eccentricAnomalyDeg[m]! * DEG;
        const sE = Math.sin(E),
          cE = Math.cos(E),
          D = 1 - e * cE;
        const Mfull = n * (ob.jd - T);
        // dE/dP, dE/dT, dE/de through Kepler's equation (M = 2π(t − T)/P).
        const dEdP = -Mfull / P / D,
          dEdT = -n / D,
          dEde = sE / D;
        const X = cE - e,
          Y = sq * sE;
        const dXdE = -sE,
          dYdE = sq * cE,
          dYde = (-e / sq) * sE;
        if (ob.kind !== 'radial-velocity') {
          // Δδ = A X + F Y, Δα* = B X + G Y.
          gy[s.P] = (A * dXdE + F * dYdE) * dEdP;
          gx[s.P] = (B * dXdE + G * dYdE) * dEdP;
          gy[s.T] = (A * dXdE + F * dYdE) * dEdT;
          gx[s.T] = (B * dXdE + G * dYdE) * dEdT;
          gy[s.e] = (A * dXdE + F * dYdE) * dEde - A + F * dYde;
          gx[s.e] = (B * dXdE + G * dYdE) * dEde - B + G * dYde;
          if (s.A >= 0) {
            gy[s.A] = X;
            gy[s.F] = Y;
            gx[s.B] = X;
            gx[s.G] = Y;
          } else {
            const dyda = (A * X + F * Y) / a,
              dxda = (B * X + G * Y) / a;
            // ∂(A,B,F,G)/∂i, ∂Ω, ∂ω (see elements.ts for the constants).
            gy[s.i] = a * si * (sw * sn * X + cw * sn * Y);
            gx[s.i] = -a * si * (sw * cn * X + cw * cn * Y);
            gy[s.node] = -B * X - G * Y;
            gx[s.node] = A * X + F * Y;
            gy[s.arg] = F * X - A * Y;
            gx[s.arg] = G * X - B * Y;
            addSize(L, theta, k, gy, dyda, a);
            addSize(L, theta, k, gx, dxda, a);
          }
          if (ob.component === 'photocentre') {
            for (let j = 0; j < np; j++) {
              gx[j] = gx[j]! * light.share;
              gy[j] = gy[j]! * light.share;
            }
            const rx = cols.dRaMas[m]!,
              ry = cols.dDecMas[m]!;
            gx[s.q] = light.dq * rx;
            gy[s.q] = light.dq * ry;
            gx[s.beta] = light.dBeta * rx;
            gy[s.beta] = light.dBeta * ry;
          }
          if (sys.x0 >= 0) {
            gx[sys.x0] = 1;
            gy[sys.y0] = 1;
          }
          if (sys.vx >= 0) {
            gx[sys.vx] = tau;
            gy[sys.vy] = tau;
          }
        } else {
          // v = γ + κ d n (−C sin E + H √(1−e²) cos E)/D.
          const q = (KAPPA * d * n) / D;
          const U = -C * sE + H * sq * cE;
          const vk = q * U;
          const dvdE = q * (-C * cE - H * sq * sE) - ((q * e * sE) / D) * U;
          const dvdeExplicit = ((q * cE) / D) * U + q * H * (-e / sq) * cE;
          gv[s.P] = -vk / P + dvdE * dEdP;
          gv[s.T] = dvdE * dEdT;
          gv[s.e] = dvdeExplicit + dvdE * dEde;
          gv[s.i] = q * a * ci * (-sw * sE + cw * sq * cE);
          gv[s.arg] = q * (-H * sE - C * sq * cE);
          if (sys.d >= 0) gv[sys.d] = gv[sys.d]! + vk / d;
          addSize(L, theta, k, gv, vk / a, a);
          // The body's share of the relative velocity (1 for a relative one), and ∂/∂q.
          if (share !== 1) for (let j = 0; j < np; j++) gv[j] = gv[j]! * share;
          if (s.q >= 0) gv[s.q] = dShare * vk;
          if (sys.gamma >= 0) gv[sys.gamma] = 1;
        }
        // 4. Into the Jacobian.
        const base = row * np;
        if (ob.kind === 'radial-velocity') {
          deriv.set(gv, base);
        } else if (ob.kind === 'offsets') {
          deriv.set(gx, base);
          deriv.set(gy, base + np);
        } else {
          const x = cols.dRaMas[m]! + x0 + vx * tau,
            y = cols.dDecMas[m]! + y0 + vy * tau;
          const r2 = x * x + y * y,
            r = Math.sqrt(r2);
          for (let j = 0; j < np; j++) {
            deriv[base + j] = (x * gx[j]! + y * gy[j]!) / r;
            deriv[base + np + j] = (y * gx[j]! - x * gy[j]!) / r2;
          }
        }
      }
      row += componentCount(ob);
    }
  }
  return { values, deriv };
}

/** Add ∂f/∂a through whatever sets a: the star's own parameter, or M, d and P (Kepler's third law). */
function addSize(
  L: Layout,
  theta: Float64Array,
  k: number,
  g: Float64Array,
  dfda: number,
  a: number,
): void {
  const s = L.stars[k]!.slots;
  if (s.a >= 0) {
    g[s.a] = g[s.a]! + dfda;
    return;
  }
  // a = 1000 (M P²)^(1/3) / d.
  g[L.sys.M] = g[L.sys.M]! + (dfda * a) / (3 * theta[L.sys.M]!);
  g[L.sys.d] = g[L.sys.d]! - (dfda * a) / theta[L.sys.d]!;
  g[s.P] = g[s.P]! + (dfda * 2 * a) / (3 * theta[s.P]!);
}
