/**
 * A Thiele–Innes solution's uncertainty, given as it is published (σ of A, B, F, G and their
 * correlations), carried to the Campbell elements the store and every prediction use: first-order
 * propagation C′ = J C Jᵀ through the Jacobian of (A, B, F, G) → (a, i, Ω, ω) at the solution,
 * the inverse of the Jacobian of the Campbell → Thiele–Innes map (derivatives below, from the
 * formulas of campbellToThieleInnes). The map is one-to-one away from a face-on orbit, so nothing
 * is lost; face-on (sin i → 0) Ω and ω are not separately defined and the conversion is refused.
 */
import { inverse, Matrix } from 'ml-matrix';
import { DEG } from '../constants.ts';
import { InputError } from '../errors.ts';
import {
  COVARIANCE_PARAMETERS,
  THIELE_INNES_PARAMETERS,
  type Covariance,
  type CovarianceParameter,
} from './types.ts';

/** Thiele–Innes constants (arcsec) and the Campbell elements they describe (a in arcsec, angles in rad). */
interface Point {
  ti: { A: number; B: number; F: number; G: number };
  campbell: { a: number; iRad: number; nodeRad: number; argRad: number };
}

/** The Campbell elements they become, in the covariance's units (arcsec, degrees). */
const CAMPBELL_OF_TI = [
  'semiMajorAxisArcsec',
  'inclinationDeg',
  'ascendingNodeDeg',
  'argPeriapsisDeg',
] as const satisfies readonly CovarianceParameter[];

/** Below this |sin i| an orbit counts as face-on: Ω and ω then have no separate σ. */
const FACE_ON_SIN_I = 1e-6;

/**
 * ∂(a, i, Ω, ω)/∂(A, B, F, G) at a solution (a in arcsec, angles in degrees): rows a, i, Ω, ω;
 * columns A, B, F, G.
 */
export function thieleInnesJacobian({ ti, campbell }: Point): number[][] {
  const { a, iRad, nodeRad, argRad } = campbell;
  const si = Math.sin(iRad);
  if (!(Math.abs(si) > FACE_ON_SIN_I))
    throw new InputError(
      'covariance',
      ti,
      'cannot be carried to Campbell elements for a face-on orbit (i = 0° or 180°), where Ω and ω are not ' +
        'separately defined: give it over a, i, Ω, ω',
    );
  const [sw, cw, sn, cn] = [
    Math.sin(argRad),
    Math.cos(argRad),
    Math.sin(nodeRad),
    Math.cos(nodeRad),
  ];
  const { A, B, F, G } = ti;
  // ∂(A, B, F, G)/∂(a, i, Ω, ω), angles per degree.
  const forward = new Matrix([
    [A / a, a * sw * sn * si * DEG, -B * DEG, F * DEG],
    [B / a, -a * sw * cn * si * DEG, A * DEG, G * DEG],
    [F / a, a * cw * sn * si * DEG, -G * DEG, -A * DEG],
    [G / a, -a * cw * cn * si * DEG, F * DEG, -B * DEG],
  ]);
  return inverse(forward).to2DArray();
}

/**
 * A covariance over any of the orbit's parameters with Thiele–Innes constants among them, as the
 * same covariance over Campbell elements: the other parameters keep their rows, A, B, F, G give way
 * to a, i, Ω, ω (constants without a row are taken as exact). Names and matrix are already checked
 * for shape, symmetry and range; `field` names the covariance in refusals.
 */
export function campbellCovariance(
  cov: { parameters: readonly string[]; matrix: readonly (readonly number[])[] },
  at: Point,
  field: string,
): Covariance {
  const tiRows = cov.parameters.flatMap((p, k) =>
    (THIELE_INNES_PARAMETERS as readonly string[]).includes(p) ? [k] : [],
  );
  const clash = cov.parameters.find((p) => (CAMPBELL_OF_TI as readonly string[]).includes(p));
  if (clash)
    throw new InputError(
      `${field}.parameters`,
      cov.parameters,
      `names both Thiele–Innes constants and ${clash}: give the covariance over A, B, F, G or over a, ` +
        `i, Ω, ω, not both`,
    );
  const J = thieleInnesJacobian(at);
  const out = COVARIANCE_PARAMETERS.filter(
    (p) => cov.parameters.includes(p) || (CAMPBELL_OF_TI as readonly string[]).includes(p),
  );
  // Rows of the linear map from the given parameters to the Campbell ones.
  const rows = out.map((p) => {
    const c = (CAMPBELL_OF_TI as readonly string[]).indexOf(p);
    return cov.parameters.map((q, k) => {
      if (c < 0) return q === p ? 1 : 0;
      return tiRows.includes(k)
        ? J[c]![(THIELE_INNES_PARAMETERS as readonly string[]).indexOf(q)]!
        : 0;
    });
  });
  const M = new Matrix(rows);
  const C = M.mmul(new Matrix(cov.matrix.map((r) => [...r]))).mmul(M.transpose());
  const matrix = out.map((_, r) => out.map((__, c) => 0.5 * (C.get(r, c) + C.get(c, r))));
  return { parameters: [...out], matrix };
}
