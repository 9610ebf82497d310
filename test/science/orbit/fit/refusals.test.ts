/**
 * A fit that the data cannot support is refused with what is missing, never answered with a number;
 * a malformed request is rejected naming the field, the value and the rule.
 */
import { describe, expect, it } from 'vitest';
import {
  FitRefusal,
  fitOrbits,
  type FitRequest,
  type MeasurementInput,
} from '../../../../server/science/orbit/fit/index.ts';
import { InputError } from '../../../../server/science/errors.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { epochs, simulate } from './simulate.ts';

const J2015 = 2457023.5;
// Invented demo orbit (not a check value).
const truth = {
  elements: {
    periodYears: 10,
    periapsis: 'J2018.1',
    eccentricity: 0.4,
    semiMajorAxisArcsec: 0.15,
    inclinationDeg: 60,
    ascendingNodeDeg: 160,
    argPeriapsisDeg: 45,
  },
  distancePc: 40,
  systemicVelocityKmS: 21,
};
const rng = new SeededRandom(3);
const good = simulate(
  truth,
  { astrometryJd: epochs(J2015, 12 * 365.25, 20, rng, 20), sigmaMas: 0.8 },
  5,
);

function refusal(request: FitRequest): FitRefusal {
  try {
    fitOrbits(request);
  } catch (err) {
    if (err instanceof FitRefusal) return err;
    throw err;
  }
  throw new Error('the fit was not refused');
}

describe('fit refusals', () => {
  it('refuses fewer measurements than free parameters', () => {
    const r = refusal({ stars: [{ name: 'Wren', measurements: good.slice(0, 3) }] });
    expect(r.reason).toBe('too-few-measurements');
    expect(r.message).toMatch(/6 measurement components .* for 7 free parameters/);
  });

  it('refuses epochs that all fall on one night', () => {
    const oneNight = good.slice(0, 10).map((m) => ({ ...m, epoch: J2015 + 0.0001 }));
    const r = refusal({ stars: [{ name: 'Wren', measurements: oneNight }] });
    expect(r.reason).toBe('single-phase');
    expect(r.message).toMatch(/one orbital phase/);
  });

  it('refuses epochs one period apart: all at the same orbital phase', () => {
    const P = 10 * 365.25;
    const samePhase = simulate(
      truth,
      { astrometryJd: Array.from({ length: 10 }, (_, k) => J2015 + k * P), sigmaMas: 0.8 },
      6,
    );
    const r = refusal({
      stars: [{ name: 'Wren', measurements: samePhase }],
      fixed: { periodYears: 10 },
    });
    expect(r.reason).toBe('single-phase');
    expect(r.message).toMatch(/all 10 epochs fall at one orbital phase/);
  });

  it('refuses a singular normal matrix and names what it cannot separate', () => {
    // Velocities from a single epoch cannot tell γ from the distance (which scales the orbital part).
    const rvNight: MeasurementInput[] = [0, 1, 2].map((k) => ({
      kind: 'radial-velocity',
      epoch: J2015 + 1000,
      radialVelocityKmS: 25 + k * 0.1,
      sigmaRadialVelocityKmS: 0.5,
    }));
    const r = refusal({
      stars: [
        {
          name: 'Wren',
          measurements: [...good, ...rvNight],
          hints: { periodYears: { min: 8, max: 12 } },
        },
      ],
    });
    expect(r.reason).toBe('singular');
    expect(r.parameters).toEqual(expect.arrayContaining(['distancePc', 'systemicVelocityKmS']));
    expect(r.message).toMatch(/cannot separate/);
  });

  it('refuses radial velocities without astrometry', () => {
    const rvOnly: MeasurementInput[] = Array.from({ length: 12 }, (_, k) => ({
      kind: 'radial-velocity',
      epoch: J2015 + 100 * k,
      radialVelocityKmS: 20,
      sigmaRadialVelocityKmS: 1,
    }));
    expect(refusal({ stars: [{ name: 'Wren', measurements: rvOnly }] }).reason).toBe(
      'no-astrometry',
    );
  });

  it('refuses a joint fit whose distance nothing constrains', () => {
    const r = refusal({
      stars: [
        { name: 'Wren', measurements: good, hints: { periodYears: { min: 8, max: 12 } } },
        { name: 'Heron', measurements: good, hints: { periodYears: { min: 8, max: 12 } } },
      ],
    });
    expect(r.reason).toBe('singular');
    expect(r.parameters).toEqual(['distancePc']);
  });

  it('rejects bad input naming the field, the value and the rule', () => {
    const bad = good.map((m, k) => (k === 2 ? { ...m, sigmaDRaMas: 0 } : m));
    expect(() => fitOrbits({ stars: [{ name: 'Wren', measurements: bad }] })).toThrow(InputError);
    try {
      fitOrbits({ stars: [{ name: 'Wren', measurements: bad }] });
    } catch (err) {
      expect((err as InputError).field).toBe('stars.0.measurements.2.sigmaDRaMas');
      expect((err as InputError).message).toMatch(/must be greater than 0/);
    }
    expect(() =>
      fitOrbits({ stars: [{ name: 'Wren', measurements: good }], fixed: { massSolar: 2 } }),
    ).toThrow(/fixed.massSolar: "massSolar" is not a parameter of this fit/);
    expect(() =>
      fitOrbits({
        stars: [{ name: 'Wren', measurements: good }],
        priors: { 'Wren.eccentricity': { mean: 0.4, sigma: -1 } },
      }),
    ).toThrow(/priors.Wren.eccentricity.sigma/);
    const start = { elements: { ...truth.elements, eccentricity: 1.2 } };
    expect(() =>
      fitOrbits({ stars: [{ name: 'Wren', measurements: good, hints: { start } }] }),
    ).toThrow(/stars.0.hints.start.elements.eccentricity: 1.2 must satisfy 0 ≤ e < 1/);
  });
});
