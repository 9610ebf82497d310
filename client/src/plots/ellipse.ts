/**
 * Astrometric error ellipses: from the uncertainties of a measurement to the semi-axes and the
 * position angle (north through east) of the major axis, in the same units as the sigmas.
 */

export interface ErrorEllipse {
  /** Semi-major and semi-minor axes, 1σ, same unit as the inputs (mas). */
  majorMas: number;
  minorMas: number;
  /** Position angle of the major axis, degrees from north through east, [0, 180). */
  paDeg: number;
}

/**
 * Ellipse of the covariance [[σα², ρσασδ], [ρσασδ, σδ²]] of (Δα*, Δδ), east positive and north positive.
 * The eigenvector (e, n) of the larger eigenvalue points along the major axis; its position angle is atan2(e, n).
 */
export function offsetsEllipse(
  sigmaRaMas: number,
  sigmaDecMas: number,
  correlation = 0,
): ErrorEllipse {
  const a = sigmaRaMas * sigmaRaMas;
  const d = sigmaDecMas * sigmaDecMas;
  const b = correlation * sigmaRaMas * sigmaDecMas;
  const mean = (a + d) / 2;
  const r = Math.hypot((a - d) / 2, b);
  const l1 = mean + r;
  const l2 = Math.max(0, mean - r);
  // The major axis lies at φ = ½·atan2(2b, a − d) from east towards north. This half-angle form
  // stays accurate for a tiny correlation, where the eigenvector (b, l1 − a) loses every digit to
  // cancellation (it put an uncorrelated 4:1 ellipse 6° off east).
  const phi = Math.atan2(2 * b, a - d) / 2;
  const e = Math.cos(phi);
  const n = Math.sin(phi);
  let pa = (Math.atan2(e, n) * 180) / Math.PI;
  pa = ((pa % 180) + 180) % 180;
  return { majorMas: Math.sqrt(l1), minorMas: Math.sqrt(l2), paDeg: pa };
}

/**
 * A separation and position angle measurement as offsets with its error ellipse: the separation
 * error lies along the radius (at the position angle), the angle error across it (σθ·ρ, θ in radians).
 */
export function separationToOffsets(
  separationMas: number,
  paDeg: number,
  sigmaSepMas: number,
  sigmaPaDeg: number,
): { dRaMas: number; dDecMas: number; ellipse: ErrorEllipse } {
  const t = (paDeg * Math.PI) / 180;
  const across = separationMas * ((sigmaPaDeg * Math.PI) / 180);
  const radialIsMajor = sigmaSepMas >= across;
  return {
    dRaMas: separationMas * Math.sin(t),
    dDecMas: separationMas * Math.cos(t),
    ellipse: {
      majorMas: Math.max(sigmaSepMas, across),
      minorMas: Math.min(sigmaSepMas, across),
      paDeg: (((radialIsMajor ? paDeg : paDeg + 90) % 180) + 180) % 180,
    },
  };
}

/**
 * SVG rotation (degrees, clockwise on screen) that turns an ellipse drawn with its major axis along
 * screen +x into one whose major axis has the given position angle, on a plot with north up and east left.
 * Position angle 0 (north) is screen up, i.e. -90° from +x; position angle 90 (east) is screen left, 180°.
 */
export const svgRotationDeg = (paDeg: number) => -90 - paDeg;
