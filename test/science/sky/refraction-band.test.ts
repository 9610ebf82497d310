/**
 * Refraction by band against ERFA (the open IAU SOFA library, through Debian's python3-erfa):
 * the constants A, B of R = A·tan z + B·tan³ z from pressure, temperature, humidity and
 * wavelength against `erfa.refco`, and the refraction at true altitudes above 15° at 0.55, 1.25
 * and 2.2 µm against `erfa.atco13` with and without air. The fixture (test/reference/
 * erfa-refraction.json, generator erfa_refraction.py beside it) is committed; when /usr/bin/python3
 * has erfa it is rebuilt into a temporary file and that is used instead.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  LOWEST_CHECKED_ALTITUDE_DEG,
  refractionConstants,
  refractionDeg,
  refractionModel,
  type RefractionConditions,
} from '../../../server/science/sky/index.ts';

const here = new URL('../../reference/', import.meta.url).pathname;
const committed = join(here, 'erfa-refraction.json');

interface Fixture {
  source: string;
  constants: (RefractionConditions & { aRad: number; bRad: number })[];
  refraction: (RefractionConditions & { trueAltDeg: number; observedAltDeg: number })[];
  lowRefraction: (RefractionConditions & { trueAltDeg: number; observedAltDeg: number })[];
}

function hasErfa(): boolean {
  if (!existsSync('/usr/bin/python3')) return false;
  try {
    execFileSync('/usr/bin/python3', ['-c', 'import erfa'], { stdio: 'ignore' });
    return true;
  } catch {
    return false;
  }
}
const erfaHere = hasErfa() && process.env.EPOCHWRIGHT_SKIP_ERFA !== '1';

function load(): Fixture {
  let path = committed;
  if (erfaHere) {
    path = join(mkdtempSync(join(tmpdir(), 'epochwright-refraction-')), 'erfa-refraction.json');
    execFileSync('/usr/bin/python3', [join(here, 'erfa_refraction.py'), path], { stdio: 'ignore' });
  }
  return JSON.parse(readFileSync(path, 'utf8')) as Fixture;
}

const ARCSEC = 1 / 3600;
const stats = (xs: number[]) => ({
  worst: Math.max(...xs.map(Math.abs)),
  rms: Math.sqrt(xs.reduce((a, x) => a + x * x, 0) / xs.length),
});

describe('refraction by band against ERFA', () => {
  const doc = load();

  it.skipIf(!erfaHere)('the committed fixture is what the installed ERFA gives', () => {
    const old = JSON.parse(readFileSync(committed, 'utf8')) as Fixture;
    expect(old.constants).toEqual(doc.constants);
    expect(old.refraction).toEqual(doc.refraction);
    expect(old.lowRefraction).toEqual(doc.lowRefraction);
  });

  it('A and B equal erfa.refco over pressure, temperature, humidity and wavelength', () => {
    let worstA = 0,
      worstB = 0;
    for (const c of doc.constants) {
      const ours = refractionConstants(c);
      worstA = Math.max(worstA, Math.abs(ours.aRad / c.aRad - 1));
      worstB = Math.max(worstB, Math.abs(ours.bRad / c.bRad - 1));
    }
    console.log(
      `refco (${doc.constants.length} cases, ${doc.source}): worst relative error A ${worstA.toExponential(1)}, B ${worstB.toExponential(1)}`,
    );
    // The same published formulas: only rounding differs (1e-12 relative; common practice, no source).
    expect(worstA).toBeLessThan(1e-12);
    expect(worstB).toBeLessThan(1e-12);
  });

  it('refraction above 15° within 1″ of erfa.atco13 at 0.55, 1.25 and 2.2 µm', () => {
    for (const wl of [0.55, 1.25, 2.2]) {
      const cases = doc.refraction.filter((c) => c.wavelengthUm === wl);
      const d = stats(
        cases.map(
          (c) =>
            (c.trueAltDeg + refractionDeg(c.trueAltDeg, refractionModel(c)) - c.observedAltDeg) /
            ARCSEC,
        ),
      );
      console.log(
        `refraction at ${wl} µm vs atco13 above 15°: worst ${d.worst.toFixed(4)}″, RMS ${d.rms.toFixed(4)}″ (n=${cases.length})`,
      );
      expect(cases.length).toBeGreaterThan(50);
      expect(d.worst).toBeLessThan(1); // issue 14 tolerance: within 1″ of ERFA above 15°
    }
  });

  it(`refraction from ${LOWEST_CHECKED_ALTITUDE_DEG}° to 15° within 2 % of erfa.atco13 at every band`, () => {
    // Below 15° the tool uses Sæmundsson's shape scaled to the series; ERFA keeps its series there.
    // Neither is exact so low; the tolerance is the tool's stated bound, and below 5° (where ERFA
    // clamps tan z) nothing outside checks it but Bennett's horizon value (published-values.test.ts).
    const cases = doc.lowRefraction;
    const rel = cases.map((c) => {
      const ours = refractionDeg(c.trueAltDeg, refractionModel(c));
      return ours / (c.observedAltDeg - c.trueAltDeg) - 1;
    });
    const abs = cases.map(
      (c) =>
        (c.trueAltDeg + refractionDeg(c.trueAltDeg, refractionModel(c)) - c.observedAltDeg) /
        ARCSEC,
    );
    const r = stats(rel),
      a = stats(abs);
    console.log(
      `refraction ${LOWEST_CHECKED_ALTITUDE_DEG}–15° vs atco13: worst ${(100 * r.worst).toFixed(2)} % (${a.worst.toFixed(2)}″), RMS ${(100 * r.rms).toFixed(2)} % (n=${cases.length}, lowest ${Math.min(...cases.map((c) => c.trueAltDeg)).toFixed(2)}°)`,
    );
    expect(cases.length).toBeGreaterThan(200);
    expect(Math.min(...cases.map((c) => c.trueAltDeg))).toBeLessThan(
      LOWEST_CHECKED_ALTITUDE_DEG + 0.5,
    );
    expect(r.worst).toBeLessThan(0.02); // the stated bound (refraction.ts): 2 % from 5° to 15°
    expect(a.worst).toBeLessThan(6); // and so within 6″ there
  });

  it('the visible-light formula alone misses by far more than 1″ in the K band', () => {
    // Sæmundsson at 1010 hPa, 10 °C scaled by P/T (Meeus, Astronomical Algorithms, eq. 16.4, ch. 16):
    // the model before; it must fail the tolerance above, so that check can fail.
    const k = doc.refraction.filter((c) => c.wavelengthUm === 2.2);
    const d = stats(
      k.map((c) => {
        const h = c.trueAltDeg;
        const r =
          ((1.02 / Math.tan(((h + 10.3 / (h + 5.11)) * Math.PI) / 180) / 60) *
            (c.pressureHpa / 1010) *
            283) /
          (273 + c.temperatureC);
        return (h + r - c.observedAltDeg) / ARCSEC;
      }),
    );
    console.log(`Sæmundsson at 2.2 µm vs atco13: worst ${d.worst.toFixed(1)}″`);
    expect(d.worst).toBeGreaterThan(3);
  });

  it('is continuous at the seam with the low-altitude shape and zero without air', () => {
    const m = refractionModel({
      pressureHpa: 700,
      temperatureC: 5,
      humidity: 0.5,
      wavelengthUm: 2.2,
    });
    const above = refractionDeg(15, m),
      below = refractionDeg(15 - 1e-9, m);
    expect(Math.abs(above - below) / ARCSEC).toBeLessThan(1e-4); // constructed case
    const none = refractionModel({
      pressureHpa: 0,
      temperatureC: 5,
      humidity: 0.5,
      wavelengthUm: 2.2,
    });
    expect(refractionDeg(30, none)).toBe(0);
  });
});
