/**
 * Duplicates: a measurement equal to a stored one (same target, kind, epoch to the second and
 * values) is refused by POST and reported per row by the import, check-only included; a file
 * imported before is recognised by its digest and refused unless allowDuplicates. Nothing is
 * written by a refusal (table counts compared before and after).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BACKENDS, fixture, tableCounts, type Fixture } from '../store/backends.ts';

interface Problem {
  line: number;
  column: string;
  rule: string;
}
const HEAD = 'system,target,kind,epoch,radialVelocityKmS,sigmaRadialVelocityKmS,instrument';
const ONE = {
  kind: 'radial-velocity',
  epoch: '2026-03-01T04:00:00Z',
  radialVelocityKmS: 120.5,
  sigmaRadialVelocityKmS: 2,
  instrument: 'twin spectrograph',
};

describe.each(BACKENDS)('duplicates on $name', (backend) => {
  let f: Fixture;
  let cleanup: () => void;
  beforeAll(async () => {
    const opened = await backend.open();
    cleanup = opened.cleanup;
    f = await fixture(opened.store);
  });
  afterAll(() => cleanup());

  const importCsv = (csv: string, query = '') =>
    f.app.request(`/api/imports/measurements${query}`, {
      method: 'POST',
      headers: { authorization: `Bearer ${f.tokens.observer}`, 'content-type': 'text/csv' },
      body: csv,
    });
  const problemsOf = async (res: Response) =>
    ((await res.json()) as { error: { details: { problems: Problem[] } } }).error.details.problems;

  it('refuses a POST equal to a stored measurement, epoch to the second, naming the stored one', async () => {
    const first = await f.call('observer', 'POST', '/api/measurements', {
      targetId: f.ids.target,
      ...ONE,
    });
    expect(first.status).toBe(201);
    const id = ((await first.json()) as { id: number }).id;
    const before = await tableCounts(f.store);
    for (const epoch of ['2026-03-01T04:00:00Z', '2026-03-01T04:00:00.300Z', 'JD 2461100.666667']) {
      const again = await f.call('observer', 'POST', '/api/measurements', {
        targetId: f.ids.target,
        ...ONE,
        epoch,
        notes: 'typed twice',
      });
      const text = await again.text();
      expect(again.status, `${epoch}: ${text}`).toBe(409);
      expect(text).toContain(`measurement ${id}`);
      expect(await tableCounts(f.store)).toEqual(before);
    }
    // 2026-03-01T04:00:00Z is JD 2461100.666667 (Unix epoch JD 2440587.5 + days; common practice, no source)
    const other = await f.call('observer', 'POST', '/api/measurements', {
      targetId: f.ids.target,
      ...ONE,
      radialVelocityKmS: 120.6,
    });
    expect(other.status).toBe(201); // another value is another measurement
    const later = await f.call('observer', 'POST', '/api/measurements', {
      targetId: f.ids.target,
      ...ONE,
      epoch: '2026-03-01T04:00:02Z',
    });
    expect(later.status).toBe(201); // and so is another second
  });

  it('reports each repeated row of an import, check-only too, and writes nothing', async () => {
    const csv = [
      HEAD,
      `Test Deep,Wren,radial-velocity,2026-03-01T04:00:00Z,120.5,2,twin spectrograph`,
      `Test Deep,Wren,radial-velocity,2026-03-02T04:00:00Z,99,2,twin spectrograph`,
      `Test Deep,Wren,radial-velocity,2026-03-02T04:00:00Z,99,2,twin spectrograph`,
    ].join('\n');
    const before = await tableCounts(f.store);
    for (const query of ['?dryRun=true', '']) {
      const res = await importCsv(csv, query);
      expect(res.status).toBe(422);
      const problems = await problemsOf(res);
      expect(problems.map((p) => p.line)).toEqual([2, 4]); // line 2 repeats the stored row, line 4 repeats line 3
      expect(problems[0]!.rule).toMatch(/stored measurement \d+/);
      expect(problems[1]!.rule).toMatch(/as line 3/);
      expect(await tableCounts(f.store)).toEqual(before);
    }
  });

  it('refuses a file imported before unless allowDuplicates', async () => {
    const csv = [
      HEAD,
      `Test Deep,Wren,radial-velocity,2026-04-01T04:00:00Z,55,2,file spectrograph`,
    ].join('\n');
    expect((await importCsv(csv)).status).toBe(200);
    const before = await tableCounts(f.store);
    for (const query of ['', '?dryRun=true']) {
      const again = await importCsv(csv, query);
      expect(again.status).toBe(422);
      const problems = await problemsOf(again);
      expect(problems).toHaveLength(1); // one problem for the file, not one per row
      expect(problems[0]!.column).toBe('(file)');
      expect(problems[0]!.rule).toMatch(/imported already .*allowDuplicates/);
      expect(await tableCounts(f.store)).toEqual(before);
    }
    const allowed = await importCsv(csv, '?allowDuplicates=true');
    expect(allowed.status).toBe(200);
    expect((await tableCounts(f.store)).measurements).toBe(before.measurements! + 1);
  });

  it('records one audit entry per import, with the file digest', async () => {
    const csv = [
      HEAD,
      ...Array.from(
        { length: 50 },
        (_, i) => `Test Deep,Wren,radial-velocity,JD ${2461000 + i},${i},2,audit spectrograph`,
      ),
    ].join('\n');
    const before = await tableCounts(f.store);
    expect((await importCsv(csv)).status).toBe(200);
    const after = await tableCounts(f.store);
    expect(after.auditTrail).toBe(before.auditTrail! + 1); // 50 rows, one entry
    expect(after.measurements).toBe(before.measurements! + 50);
  });
});
