/** Night-report drafts: the form round trip, the field-by-field differences and the merge after a conflict. */
import { describe, expect, test } from 'vitest';
import {
  bodyOf,
  differences,
  formOf,
  merge,
  numberProblems,
} from '../../client/src/views/report-draft.ts';
import type { ReportRow } from '../../client/src/api/client.ts';

// Invented report values (demo only).
const stored: ReportRow = {
  id: 7,
  nightId: 3,
  seeingArcsec: 0.8,
  strehlRatio: 0.4,
  cloudCoverPct: 10,
  humidityPct: 30,
  windMS: 5,
  temperatureC: 8,
  timeLostHours: 0,
  timeLostReason: '',
  notes: 'steady',
  version: 2,
  authorId: null,
  createdAt: '2027-06-02T10:00:00Z',
  outcomes: [
    {
      id: 5,
      reportId: 1,
      blockId: 11,
      status: 'obtained',
      previousStatus: 'planned',
      exposureMinutes: 40,
      notes: '',
    },
  ],
};

describe('report drafts', () => {
  test('a stored report survives form and body unchanged; empty numbers become null; unreported blocks are left out', () => {
    const form = formOf(stored, [11, 12]);
    expect(form.conditions.seeingArcsec).toBe('0.8');
    expect(form.outcomes[12]).toEqual({ status: '', exposureMinutes: '', notes: '' });
    const body = bodyOf(form);
    expect(body).toMatchObject({
      seeingArcsec: 0.8,
      strehlRatio: 0.4,
      timeLostHours: 0,
      notes: 'steady',
    });
    expect(body.outcomes).toEqual([
      { blockId: 11, status: 'obtained', exposureMinutes: 40, notes: '' },
    ]);
    form.conditions.windMS = '';
    expect(bodyOf(form).windMS).toBeNull();
  });

  test('differences list exactly the fields that differ, and merge takes the chosen side of each', () => {
    const mine = formOf(stored, [11]);
    mine.conditions.seeingArcsec = '1.1';
    mine.notes = 'mine';
    const theirs = formOf(
      {
        ...stored,
        strehlRatio: 0.2,
        notes: 'theirs',
        outcomes: [
          {
            id: 5,
            reportId: 1,
            blockId: 11,
            status: 'lost',
            previousStatus: 'planned',
            exposureMinutes: null,
            notes: 'clouds',
          },
        ],
      },
      [11],
    );
    const d = differences(mine, theirs);
    expect(d.map((x) => x.path).sort()).toEqual([
      'conditions.seeingArcsec',
      'conditions.strehlRatio',
      'notes',
      'outcomes.11',
    ]);
    const merged = merge(mine, theirs, {
      'conditions.seeingArcsec': 'mine',
      'conditions.strehlRatio': 'theirs',
      notes: 'mine',
      'outcomes.11': 'theirs',
    });
    expect(merged.conditions.seeingArcsec).toBe('1.1');
    expect(merged.conditions.strehlRatio).toBe('0.2');
    expect(merged.notes).toBe('mine');
    expect(merged.outcomes[11]).toEqual({ status: 'lost', exposureMinutes: '', notes: 'clouds' });
    expect(
      differences(
        merged,
        merge(mine, theirs, {
          'conditions.seeingArcsec': 'mine',
          'conditions.strehlRatio': 'theirs',
          notes: 'mine',
          'outcomes.11': 'theirs',
        }),
      ),
    ).toEqual([]);
  });
});

describe('numbers the form cannot read', () => {
  test('a decimal comma names its fix; other text is named as not a number (constructed cases)', () => {
    const f = formOf(null, []);
    f.conditions.timeLostHours = '1,5';
    f.conditions.seeingArcsec = 'good';
    f.conditions.windMS = '12.5';
    f.conditions.temperatureC = '-3';
    expect(numberProblems(f)).toEqual({
      timeLostHours: '“1,5” has a comma: use a decimal point: 1.5',
      seeingArcsec: '“good” is not a number',
    });
  });
});
