/**
 * The `night` and `season` commands end to end through the real CLI entry: table, --json, --csv,
 * and exit code 2 with the field named on bad input. Site and targets are invented.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { cli } from './run-cli.ts';

const dir = mkdtempSync(join(tmpdir(), 'epochwright-sky-cli-'));
const siteFile = join(dir, 'site.json');
const targetsFile = join(dir, 'targets.json');
writeFileSync(
  siteFile,
  JSON.stringify({
    name: 'Loma Serena',
    latitudeDeg: -24.6,
    longitudeDeg: -70.4,
    elevationM: 2600,
    timeZone: 'America/Santiago',
  }),
);
writeFileSync(
  targetsFile,
  JSON.stringify([
    { name: 'Tern-3', raDeg: 271.3, decDeg: -25.1 },
    { name: 'Vireo A', raDeg: 30, decDeg: 80 },
  ]),
);

describe('epochwright night', () => {
  it('prints twilights, the Moon and a window table in local time', async () => {
    const r = await cli([
      'night',
      '--site',
      siteFile,
      '--targets',
      targetsFile,
      '--date',
      '2027-06-15',
    ]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/astronomical 06-15 19:2\d/);
    expect(r.stdout).toMatch(/^Tern-3 +06-15 20:\d\d +06-16 05:\d\d/m);
    expect(r.stdout).toMatch(/no window tonight: Vireo A/);
  });

  it('gives JSON with UTC and local times, and CSV with a header', async () => {
    const j = await cli([
      'night',
      '--site',
      siteFile,
      '--targets',
      targetsFile,
      '--date',
      '2027-06-15',
      '--json',
    ]);
    const body = JSON.parse(j.stdout) as {
      targets: { windows: { start: { utc: string; local: string } }[] }[];
    };
    expect(body.targets[0]!.windows[0]!.start.utc).toMatch(/^2027-06-16T00:\d\d:\d\dZ$/);
    expect(body.targets[0]!.windows[0]!.start.local).toMatch(/-04:00$/);
    const c = await cli([
      'night',
      '--site',
      siteFile,
      '--targets',
      targetsFile,
      '--date',
      '2027-06-15',
      '--csv',
    ]);
    expect(c.stdout.split('\n')[0]).toBe(
      'target,opens_utc,closes_utc,hours,opened_by,closed_by,transit,best_airmass,best_at,moon_deg',
    );
  });

  it('exits 2 naming the field on bad input', async () => {
    const r = await cli([
      'night',
      '--site',
      siteFile,
      '--targets',
      '[{"name":"x","raDeg":1,"decDeg":95}]',
      '--date',
      '2027-06-15',
    ]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/targets\.0\.decDeg: 95 must lie in/);
    const d = await cli([
      'night',
      '--site',
      siteFile,
      '--targets',
      targetsFile,
      '--date',
      'tomorrow',
    ]);
    expect(d.code).toBe(2);
    expect(d.stderr).toMatch(/--date/);
  });
});

describe('epochwright season', () => {
  it('prints one line per target, and one CSV line per night', async () => {
    const r = await cli([
      'season',
      '--site',
      siteFile,
      '--targets',
      targetsFile,
      '--year',
      '2027',
      '--step',
      'PT10M',
    ]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^Tern-3 +2027-\d\d-\d\d +2027-\d\d-\d\d/m);
    expect(r.stdout).toMatch(/^Vireo A +—/m);
    const c = await cli([
      'season',
      '--site',
      siteFile,
      '--targets',
      targetsFile,
      '--year',
      '2027',
      '--step',
      'PT10M',
      '--csv',
    ]);
    const lines = c.stdout.trim().split('\n');
    expect(lines[0]).toBe('date,dark_h,Tern-3_h,Vireo A_h');
    expect(lines).toHaveLength(366);
  });
});
