/**
 * Binaries of comparable mass: velocities of the primary, the secondary or both about the
 * barycentre, with the mass ratio q = M₂/M₁ fitted; a published double-lined visual binary; and
 * the refusals and warnings that keep a primary's velocities from passing for the star's.
 */
import { describe, expect, it } from 'vitest';
import {
  fitOrbits,
  FitRefusal,
  type FitResult,
} from '../../../../server/science/orbit/fit/index.ts';
import type { CampbellInput, OrbitInput } from '../../../../server/science/orbit/index.ts';
import { InputError } from '../../../../server/science/errors.ts';
import { SeededRandom } from '../../../../server/science/random.ts';
import { simulateBinary, type BinaryPlan } from './binary-simulate.ts';
import { recoveryCheck } from './recovery.ts';
import { epochs } from './simulate.ts';

const J2015 = 2457023.5;
const YR = 365.25;

/** Invented (demo values): q = 0.6, 3.63 M☉ in all at 31.5 pc, P = 6 yr. */
const Q = 0.6;
const elements: CampbellInput = {
  periodYears: 6,
  periapsis: 'J2019.3',
  eccentricity: 0.45,
  semiMajorAxisArcsec: 0.1611,
  inclinationDeg: 62,
  ascendingNodeDeg: 130,
  argPeriapsisDeg: 75,
};
const truth: OrbitInput = {
  elements,
  distancePc: 31.5,
  systemicVelocityKmS: 12,
};
const hints = { periodYears: { min: 4, max: 9 } };

function plan(
  r: SeededRandom,
  bodies: ('primary' | 'secondary')[],
  label?: 'relative',
): BinaryPlan {
  return {
    astrometryJd: epochs(J2015, 8 * YR, 24, r, 20),
    sigmaMas: 1,
    primaryJd: bodies.includes('primary') ? epochs(J2015 + 50, 7 * YR, 16, r, 20) : [],
    secondaryJd: bodies.includes('secondary') ? epochs(J2015 + 80, 7 * YR, 16, r, 20) : [],
    sigmaKmS: 0.5,
    ...(label ? { label } : {}),
  };
}
const measurements = (seed: number, bodies: ('primary' | 'secondary')[], label?: 'relative') =>
  simulateBinary(truth, Q, plan(new SeededRandom(2 * seed), bodies, label), 2 * seed + 1);

const quantity = (res: FitResult, name: string) => {
  const q = res.stars[0]!.quantities.find((x) => x.name === name);
  if (!q) throw new Error(`no quantity ${name}`);
  return q;
};

describe('double-lined binary (q = 0.6), seeded recovery', () => {
  // Pulls of every fitted parameter, the mass ratio among them (checks in recovery.ts).
  recoveryCheck(
    {
      name: 'double-lined, q = 0.6',
      truth,
      hints,
      measurements: (seed) => measurements(seed, ['primary', 'secondary']),
      extraTruth: { massRatio: Q },
    },
    30,
  );

  it('gives both masses with σ that cover the truth (30 realizations)', () => {
    // Truth from Kepler's third law, M = a[au]³/P[yr]² (common practice, no source; the IAU
    // GM☉ form differs by 4e-5, far inside these σ): 5.0747³/36.
    const total = (0.1611 * 31.5) ** 3 / 36;
    const z: Record<string, number[]> = { primaryMassSolar: [], secondaryMassSolar: [] };
    const expected = {
      primaryMassSolar: total / (1 + Q),
      secondaryMassSolar: (total * Q) / (1 + Q),
    };
    for (let k = 0; k < 30; k++) {
      const res = fitOrbits({
        stars: [
          { name: 'X', measurements: measurements(1000 + k, ['primary', 'secondary']), hints },
        ],
      });
      for (const name of ['primaryMassSolar', 'secondaryMassSolar'] as const) {
        const q = quantity(res, name);
        z[name]!.push((q.value - expected[name]) / q.sigma);
      }
    }
    for (const [name, zs] of Object.entries(z)) {
      const mean = zs.reduce((a, b) => a + b, 0) / zs.length;
      const rms = Math.sqrt(zs.reduce((a, b) => a + b * b, 0) / zs.length);
      console.log(`${name}: mean z ${mean.toFixed(2)}, rms z ${rms.toFixed(2)}`);
      // Unbiased: mean z within 3/√N; honest σ: rms z within 1 ± 0.35 (the 99% band of a χ²
      // with 30 degrees of freedom, √(χ²/30) from 0.63 to 1.33; common practice, no source).
      expect(Math.abs(mean)).toBeLessThan(3 / Math.sqrt(zs.length));
      expect(rms).toBeGreaterThan(0.65);
      expect(rms).toBeLessThan(1.35);
    }
  });
});

describe('published double-lined visual binary', () => {
  // Capella (α Aurigae): Torres, Claret, Fekel et al., ApJ 700, 1349 (2009), Table 6 (orbit) and
  // Table 7 (masses), from memory: P = 104.02128 d, e = 0.00089, i = 137.156°, Ω = 40.522°,
  // a″ = 56.465 mas, K_A = 25.96 km/s, K_B = 26.86 km/s; M_A = 2.5687 ± 0.0074 M☉,
  // M_B = 2.4828 ± 0.0067 M☉. T, ω and γ do not enter the masses; those used here are constructed.
  const P = 104.02128,
    e = 0.00089,
    i = 137.156,
    aArcsec = 0.056465,
    kA = 25.96,
    kB = 26.86;
  // The orbital parallax these imply: a[au] = (K_A + K_B)·P·√(1−e²)/(2π sin i) (Heintz, Double
  // Stars, ch. 5, from memory), with the IAU 2012 au.
  const aAu =
    ((kA + kB) * P * 86_400 * Math.sqrt(1 - e * e)) /
    (2 * Math.PI * Math.sin((i * Math.PI) / 180)) /
    149_597_870.7;
  const capella: OrbitInput = {
    elements: {
      periodYears: P / YR,
      periapsis: 'JD 2447528.45',
      eccentricity: e,
      semiMajorAxisArcsec: aArcsec,
      inclinationDeg: i,
      ascendingNodeDeg: 40.522,
      argPeriapsisDeg: 162.6,
    },
    distancePc: aAu / aArcsec,
    systemicVelocityKmS: 29.2,
  };

  it('gives the published masses from noise-free measurements of the published orbit', () => {
    const r = new SeededRandom(5);
    // Constructed case: measurements on the published orbit with tiny σ (noise 1e-6 of them).
    const m = simulateBinary(
      capella,
      kA / kB,
      {
        astrometryJd: epochs(2447500, 2.2 * P, 30, r, 1),
        sigmaMas: 1e-4,
        primaryJd: epochs(2447510, 2 * P, 20, r, 1),
        secondaryJd: epochs(2447515, 2 * P, 20, r, 1),
        sigmaKmS: 1e-4,
      },
      9,
    );
    const res = fitOrbits({
      stars: [
        { name: 'Capella', measurements: m, hints: { periodYears: { min: 0.27, max: 0.3 } } },
      ],
    });
    const mA = quantity(res, 'primaryMassSolar').value,
      mB = quantity(res, 'secondaryMassSolar').value;
    console.log(
      `Capella: M_A ${mA.toFixed(4)} (2.5687 ± 0.0074), M_B ${mB.toFixed(4)} (2.4828 ± 0.0067), q ${quantity(res, 'massRatio').value.toFixed(5)}, parallax ${(1000 / quantity(res, 'distancePc').value).toFixed(2)} mas`,
    );
    expect(Math.abs(mA - 2.5687)).toBeLessThan(0.0074);
    expect(Math.abs(mB - 2.4828)).toBeLessThan(0.0067);
    // The parallax the published orbit implies against the trigonometric one: 76.20 ± 0.46 mas
    // (Hipparcos, new reduction: van Leeuwen, A&A 474, 653, 2007; from memory), within its 1σ.
    expect(Math.abs(1000 / quantity(res, 'distancePc').value - 76.2)).toBeLessThan(0.46);
    expect(quantity(res, 'primarySemiAmplitudeKmS').value).toBeCloseTo(kA, 3);
    expect(quantity(res, 'secondarySemiAmplitudeKmS').value).toBeCloseTo(kB, 3);
  });
});

describe('velocities of one body', () => {
  it('are refused without a parallax or a known q: the distance and q are not told apart', () => {
    for (const body of ['primary', 'secondary'] as const) {
      let err: unknown;
      try {
        fitOrbits({ stars: [{ name: 'X', measurements: measurements(7, [body]), hints }] });
      } catch (e) {
        err = e;
      }
      expect(err).toBeInstanceOf(FitRefusal);
      expect((err as FitRefusal).parameters).toEqual(['X.massRatio', 'distancePc']);
      expect((err as Error).message).toMatch(body === 'primary' ? /d·q\/\(1\+q\)/ : /d\/\(1\+q\)/);
    }
  });

  it('give q with a parallax prior (the primary alone)', () => {
    const res = fitOrbits({
      stars: [{ name: 'X', measurements: measurements(8, ['primary']), hints }],
      priors: { distancePc: { mean: 31.5, sigma: 0.3 } },
    });
    const q = quantity(res, 'massRatio');
    console.log(
      `primary alone, parallax prior: q = ${q.value.toFixed(3)} ± ${q.sigma.toFixed(3)} (truth 0.6)`,
    );
    expect(Math.abs(q.value - Q)).toBeLessThan(4 * q.sigma);
    expect(q.sigma).toBeLessThan(0.05);
  });

  it('refuse q fixed at 0 when the primary moves', () => {
    expect(() =>
      fitOrbits({
        stars: [{ name: 'X', measurements: measurements(8, ['primary']), hints }],
        fixed: { massRatio: 0 },
      }),
    ).toThrow(/fixed at 0, but the primary's velocities say it moves/);
  });
});

describe('a primary-velocity set that is not marked as such', () => {
  it('is flagged when fitted as relative: the mass of stars with the primary at rest', () => {
    // The old silent failure: the primary's velocities read as the star's.
    const res = fitOrbits({
      stars: [{ name: 'X', measurements: measurements(3, ['primary'], 'relative'), hints }],
    });
    const d = quantity(res, 'distancePc').value;
    expect(d).toBeLessThan(20); // constructed case: the true 31.5 pc shrinks by q/(1+q) = 0.375
    expect(res.warnings.join('\n')).toMatch(
      /radial velocities are "relative".*mark each "primary" or "secondary"/,
    );
  });

  it('is not flagged around a compact object (no warning for a mass of millions of M☉)', () => {
    const heavy: OrbitInput = {
      ...truth,
      distancePc: 11_500,
      elements: { ...elements, semiMajorAxisArcsec: 0.12 },
    };
    const r = new SeededRandom(4);
    const m = simulateBinary(heavy, 0, { ...plan(r, ['secondary']), sigmaKmS: 20 }, 11).map((x) =>
      x.kind === 'radial-velocity' ? { ...x, component: 'relative' as const } : x,
    );
    const res = fitOrbits({ stars: [{ name: 'S', measurements: m, hints }] });
    expect(quantity(res, 'massSolar').value).toBeGreaterThan(1e5);
    expect(res.warnings.filter((w) => w.includes('"relative"'))).toEqual([]);
  });

  it('refuses relative and barycentric velocities mixed in one star', () => {
    const m = measurements(3, ['primary', 'secondary']);
    const k = m.findIndex((x) => x.kind === 'radial-velocity');
    m[k] = { ...m[k]!, component: 'relative' } as (typeof m)[number];
    let err: unknown;
    try {
      fitOrbits({ stars: [{ name: 'X', measurements: m, hints }] });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).field).toBe(`stars.0.measurements.${k}.component`);
  });

  it('refuses barycentric velocities in a joint fit and with relativistic terms', () => {
    const m = measurements(3, ['primary', 'secondary']);
    expect(() =>
      fitOrbits({
        stars: [
          { name: 'X', measurements: m, hints },
          { name: 'Y', measurements: m, hints },
        ],
      }),
    ).toThrow(/joint fit models stars around one primary at rest/);
    expect(() =>
      fitOrbits({
        stars: [{ name: 'X', measurements: m, hints }],
        relativity: { gravitationalRedshift: true },
      }),
    ).toThrow(/without relativistic terms/);
  });

  it('refuses a position marked as of one body', () => {
    const m = measurements(3, ['secondary']);
    expect(() =>
      fitOrbits({
        stars: [
          {
            name: 'X',
            measurements: [{ ...m[0]!, component: 'primary' } as never, ...m.slice(1)],
            hints,
          },
        ],
      }),
    ).toThrow(
      /stars\.0\.measurements\.0\.component.*a position is of the secondary relative to the primary/,
    );
  });
});
