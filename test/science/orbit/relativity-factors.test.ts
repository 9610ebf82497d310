/**
 * The redshift and precession factors scale the switched-on terms: 0 Newtonian, 1 general
 * relativity (DESIGN.md). Invented orbit (demo values, not check values).
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../server/science/errors.ts';
import { predict, validateOrbit, type OrbitInput } from '../../../server/science/orbit/index.ts';

const base: OrbitInput = {
  elements: {
    periodYears: 12,
    periapsis: '2029-03-01T00:00:00Z',
    eccentricity: 0.82,
    semiMajorAxisArcsec: 0.11,
    inclinationDeg: 47,
    ascendingNodeDeg: 318,
    argPeriapsisDeg: 152,
  },
  distancePc: 9000,
  relativity: { gravitationalRedshift: true, transverseDoppler: true, precession: true },
};
const at = validateOrbit(base).periapsisJd + 30;

describe('relativity factors', () => {
  it('scale the redshift terms linearly and switch them off at 0', () => {
    const gr = predict(validateOrbit(base), at);
    const half = predict(
      validateOrbit({ ...base, relativityFactors: { redshiftFactor: 0.5 } }),
      at,
    );
    const none = predict(validateOrbit({ ...base, relativityFactors: { redshiftFactor: 0 } }), at);
    const terms = gr.gravitationalRedshiftKmS! + gr.transverseDopplerKmS!;
    // Linearity of the first-order terms: common practice, no source.
    expect(half.radialVelocityKmS! - none.radialVelocityKmS!).toBeCloseTo(terms / 2, 9);
    expect(gr.radialVelocityKmS! - none.radialVelocityKmS!).toBeCloseTo(terms, 9);
    expect(none.radialVelocityKmS).toBeCloseTo(none.keplerianRvKmS!, 12);
  });

  it('scale the precession: factor 0 is the Keplerian position', () => {
    const off = predict(validateOrbit({ ...base, relativity: {} }), at + 3000);
    const zero = predict(
      validateOrbit({ ...base, relativityFactors: { precessionFactor: 0 } }),
      at + 3000,
    );
    const two = predict(
      validateOrbit({ ...base, relativityFactors: { precessionFactor: 2 } }),
      at + 3000,
    );
    const one = predict(validateOrbit(base), at + 3000);
    expect(zero.dRaMas).toBeCloseTo(off.dRaMas, 12);
    expect(two.precessionDeg! / one.precessionDeg!).toBeCloseTo(2, 12);
  });

  it('refuse a factor that is not a finite number or not a factor, naming the field', () => {
    const bad = (f: unknown) => () =>
      validateOrbit({ ...base, relativityFactors: f as OrbitInput['relativityFactors'] });
    expect(bad({ redshiftFactor: 'one' })).toThrow(InputError);
    expect(bad({ redshiftFactor: 'one' })).toThrow(/orbit\.relativityFactors\.redshiftFactor/);
    expect(bad({ lenseThirring: 1 })).toThrow(/is not a factor/);
    expect(bad({ precessionFactor: 1e6 })).toThrow(/±100/);
  });
});
