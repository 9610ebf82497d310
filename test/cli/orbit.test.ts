import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { MEEUS_57A } from '../fixtures/orbits.ts';
import { cli } from './run-cli.ts';

const dir = mkdtempSync(join(tmpdir(), 'epochwright-cli-'));
const orbitFile = join(dir, 'orbit.json');
writeFileSync(orbitFile, JSON.stringify(MEEUS_57A));

describe('epochwright CLI, orbit commands', () => {
  it('reproduces Meeus Example 57.a from its elements (θ = 318.42°, ρ = 0.4110″)', async () => {
    // Meeus, Astronomical Algorithms, 2nd ed., Example 57.a (from memory)
    const r = await cli(['ephemeris', '--orbit', orbitFile, '--at', 'J1980.0', '--json']);
    expect(r.code).toBe(0);
    const body = JSON.parse(r.stdout) as {
      predictions: { positionAngleDeg: number; separationMas: number }[];
    };
    expect(Math.abs(body.predictions[0]!.positionAngleDeg - 318.42)).toBeLessThan(0.01);
    expect(Math.abs(body.predictions[0]!.separationMas - 411.0)).toBeLessThan(0.1);
  });

  it('prints an aligned table by default and CSV on request', async () => {
    const t = await cli([
      'ephemeris',
      '--orbit',
      JSON.stringify(MEEUS_57A),
      '--start',
      'J1980',
      '--end',
      'J1982',
      '--step',
      'P365DT6H', // one Julian year, 365.25 d (IAU, from memory)
      '--time',
      'julian',
    ]);
    expect(t.code).toBe(0);
    const lines = t.stdout.trimEnd().split('\n');
    expect(lines[0]).toMatch(/^epoch\s+rho_mas\s+theta_deg/);
    expect(lines).toHaveLength(5);
    expect(lines[2]).toMatch(/^J1980\.000000\s+411\.0\d\d\s+318\.42\d/);
    const c = await cli(['ephemeris', '--orbit', orbitFile, '--at', 'J1980,J1981', '--csv']);
    expect(c.stdout.split('\n')[0]).toBe('epoch,rho_mas,theta_deg,dra_mas,ddec_mas,nu_deg');
  });

  it('lists events', async () => {
    const r = await cli([
      'events',
      '--orbit',
      orbitFile,
      '--start',
      '1970-01-01',
      '--end',
      '2020-01-01',
      '--kinds',
      'periapsis',
    ]);
    expect(r.code).toBe(0);
    // Two passages 41.623 yr apart after T = 1934.008 (Meeus Example 57.a elements): 1975.6 and 2017.3.
    expect(r.stdout).toMatch(/periapsis\s+1975-08/);
    expect(r.stdout).toMatch(/periapsis\s+2017-04/);
  });

  it('on bad input: a message on stderr naming the field, exit code 2, nothing on stdout', async () => {
    const bad = { ...MEEUS_57A, elements: { ...MEEUS_57A.elements, inclinationDeg: 200 } };
    const r = await cli(['ephemeris', '--orbit', JSON.stringify(bad), '--at', 'J1980']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/inclinationDeg: 200 must satisfy 0 ≤ i ≤ 180/);
    for (const args of [
      ['ephemeris', '--orbit', orbitFile],
      ['ephemeris', '--orbit', orbitFile, '--at', 'soon'],
      [
        'events',
        '--orbit',
        orbitFile,
        '--start',
        '2020-01-01',
        '--end',
        '2030-01-01',
        '--kinds',
        'eclipse',
      ],
      ['ephemeris', '--orbit', join(dir, 'missing.json'), '--at', 'J1980'],
      ['ephemeris', '--bogus'],
      ['nonsense'],
    ]) {
      const x = await cli(args);
      expect(x.code, args.join(' ')).toBe(2);
      expect(x.stdout, args.join(' ')).toBe('');
      expect(x.stderr.length).toBeGreaterThan(0);
    }
  });

  it('shows help for each command', async () => {
    for (const c of ['ephemeris', 'events']) {
      const r = await cli([c, '--help']);
      expect(r.code).toBe(0);
      expect(r.stdout).toMatch(/^usage: epochwright/);
    }
  });
});
