/** Parallactic angle against astronomia's implementation of Meeus, eq. 14.1, for random geometry. */
import { parallactic } from 'astronomia';
import { expect, it } from 'vitest';
import { parallacticAngleRad } from '../../../server/science/sky/index.ts';
import { seeded } from './helpers.ts';

it('matches astronomia (Meeus eq. 14.1) to 1e-12 rad', () => {
  const rnd = seeded(314);
  let worst = 0;
  for (let i = 0; i < 2000; i++) {
    const lat = (rnd() - 0.5) * 0.99 * Math.PI,
      dec = (rnd() - 0.5) * 0.99 * Math.PI,
      ha = (rnd() - 0.5) * 2 * Math.PI;
    const d = parallacticAngleRad(ha, dec, lat) - parallactic.parallacticAngle(lat, dec, ha);
    worst = Math.max(worst, Math.abs(Math.atan2(Math.sin(d), Math.cos(d))));
  }
  expect(worst).toBeLessThan(1e-12); // astronomia 4.2 parallactic.parallacticAngle
});

it('is 0 on the meridian south of the zenith (northern site) and ±90° on the horizon at the equator', () => {
  expect(parallacticAngleRad(0, 0.2, 0.8)).toBeCloseTo(0, 15); // common practice, no source
  expect(Math.abs(parallacticAngleRad(Math.PI / 2, 0, 0))).toBeCloseTo(Math.PI / 2, 12); // Meeus eq. 14.1 with φ = 0, δ = 0, H = 90°: tan q = 1/0 (from memory)
});
