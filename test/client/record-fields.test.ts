/**
 * The records page's create forms and tables take every field of an entity from its one registry
 * entry (client/src/views/record-fields.ts): the lists they show are derived, and no other client
 * module writes an entity's field list again. The expected labels and orders are the page's words
 * before the registry existed (the browser tests in test/e2e read them), so a drift shows here.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import {
  RECORD_FIELDS,
  type RecordEntity,
  formFields,
  tableColumns,
} from '../../client/src/views/record-fields.ts';

const ENTITIES = Object.keys(RECORD_FIELDS) as RecordEntity[];
const stored = {
  systems: [
    { id: 4, name: 'Quill Pair' },
    { id: 9, name: 'Lantern Triple' },
  ],
  targets: [{ id: 2, name: 'Quill Pair B' }],
  sites: [
    { id: 1, name: 'Harrow Knoll' },
    { id: 3, name: 'Saltpan Ridge' },
  ],
};
const formWords = (e: RecordEntity) =>
  formFields(e, stored).map((f) => `${f.key} · ${f.label} · ${f.kind}${f.optional ? '?' : ''}`);
const tableWords = (e: RecordEntity) =>
  tableColumns(e).map((c) => `${c.key} · ${c.label}${c.editable ? ` · ${c.editable}` : ''}`);

describe('forms and tables derive from the registry', () => {
  test.each(ENTITIES)('%s: every form key and every table column is a registry field', (e) => {
    const fields = RECORD_FIELDS[e] as { key: string; input?: object; column?: { key?: string } }[];
    const keys = fields.map((f) => f.key);
    expect(new Set(keys).size).toBe(keys.length);
    const form = formFields(e, stored).map((f) => f.key);
    expect(form.every((k) => keys.includes(k))).toBe(true);
    expect([...form].sort()).toEqual(
      fields
        .filter((f) => f.input)
        .map((f) => f.key)
        .sort(),
    );
    // A column shows its field's own row property unless the entry names another (a target's system).
    expect(tableColumns(e).map((c) => c.key)).toEqual(
      fields.filter((f) => f.column).map((f) => f.column!.key ?? f.key),
    );
  });

  test('the systems: one entry holds the form’s degrees and the table’s sexagesimal wording', () => {
    expect(formWords('systems')).toEqual([
      'name · name · text',
      'raDeg · RA (°, ICRS) · number',
      'decDeg · Dec (°, ICRS) · number',
      'positionEpoch · position epoch · text?',
      'pmRaMasYr · μα* (mas/yr) · number?',
      'pmDecMasYr · μδ (mas/yr) · number?',
      'distancePc · distance (pc) · number?',
      'massSolar · mass (M☉) · number?',
      'notes · notes · textarea?',
    ]);
    expect(tableWords('systems')).toEqual([
      'name · name · text',
      'raDeg · RA (h:m:s, ICRS) · angle',
      'decDeg · Dec (°:′:″, ICRS) · angle',
      'distancePc · distance (pc) · number',
      'massSolar · mass (M☉) · number',
    ]);
    // The table shows the sexagesimal form (arithmetic: 12.5° / 15 = 0 h 50 min; 0.25° = 15′; sexagesimal arithmetic, common practice, no source).
    const [, ra, dec] = tableColumns('systems');
    expect(ra!.format!(12.5)).toBe('00:50:00.00');
    expect(dec!.format!(-40.25)).toBe('-40:15:00.0');
  });

  test('the targets: the form asks the system first, the table shows it by name second', () => {
    expect(formWords('targets')).toEqual([
      'systemId · system · select',
      'name · name · text',
      'magnitude · magnitude · number?',
      'band · band · text?',
      'notes · notes · textarea?',
    ]);
    expect(tableWords('targets')).toEqual([
      'name · name · text',
      'systemName · system',
      'magnitude · magnitude · number',
      'band · band · text',
    ]);
    const [system] = formFields('targets', stored);
    expect(system!.options).toEqual([
      { value: '4', label: 'Quill Pair' },
      { value: '9', label: 'Lantern Triple' },
    ]);
    expect(system!.initial).toBe('4');
    expect(system!.toValue!('9')).toBe(9);
    expect(formFields('targets', { ...stored, systems: [] })[0]!.initial).toBe('');
  });

  test('the sites: form-only inputs and table-only precision columns keep their places', () => {
    expect(formWords('sites')).toEqual([
      'name · name · text',
      'latitudeDeg · latitude (°, N +) · number',
      'longitudeDeg · longitude (°, E +) · number',
      'elevationM · elevation (m) · number',
      'timeZone · time zone (IANA) · text',
      'lowestAltitudeDeg · lowest altitude (°) · number?',
      'leastSunDistanceDeg · least Sun distance (°) · number?',
      'pressureHpa · pressure (hPa) · number?',
      'temperatureC · temperature (°C) · number?',
      'humidityPct · humidity (%) · number?',
      'wavelengthUm · wavelength (µm) · number?',
      'horizonMask · horizon mask · mask?',
      'laserGuideStar · laser guide star · boolean',
      'notes · notes · textarea?',
    ]);
    expect(tableWords('sites')).toEqual([
      'name · name · text',
      'latitudeDeg · latitude (°, N +) · number',
      'longitudeDeg · longitude (°, E +) · number',
      'elevationM · elevation (m) · number',
      'timeZone · time zone (IANA) · text',
      'lowestAltitudeDeg · lowest altitude (°) · number',
      'leastSunDistanceDeg · least Sun distance (°) · number',
      'laserGuideStar · laser guide star · boolean',
      'astrometrySigmaMas · astrometry σ at zenith (mas) · number',
      'spectroscopySigmaKmS · RV σ at zenith (km/s) · number',
      'referenceSeeingArcsec · σ holds for seeing (″) · number',
    ]);
    expect(tableColumns('sites').at(-1)!.empty).toBe('any (default)');
  });

  test('the campaigns: a form only; its id checkboxes list the stored targets and sites', () => {
    expect(formWords('campaigns')).toEqual([
      'name · name · text',
      'startDate · first night · date',
      'endDate · last night · date',
      'goals.cadenceDays · cadence (days) · number',
      'goals.kinds · measurements · select',
      'goals.densifiedCadenceDays · cadence near periapsis (days) · number?',
      'goals.densifyWithinDays · near periapsis means within (days) · number?',
      'goals.wavelengthUm · wavelength (µm) · number?',
      'limits.highestAirmass · highest airmass · number?',
      'limits.leastMoonDistanceDeg · least Moon distance (°) · number?',
      'limits.darkness · darkness · select?',
      'targetIds · targets · ids',
      'siteIds · sites · ids',
      'notes · notes · textarea?',
    ]);
    expect(tableColumns('campaigns')).toEqual([]);
    const byKey = Object.fromEntries(formFields('campaigns', stored).map((f) => [f.key, f]));
    expect(byKey.siteIds!.options).toEqual([
      { value: '1', label: 'Harrow Knoll' },
      { value: '3', label: 'Saltpan Ridge' },
    ]);
    expect(byKey.siteIds!.initial).toEqual([]);
    expect(byKey.targetIds!.options).toEqual([{ value: '2', label: 'Quill Pair B' }]);
    expect(byKey['goals.kinds']!.initial).toBe('astrometry');
  });
});

describe('no entity list is written elsewhere', () => {
  const dir = 'client/src';
  const files = (readdirSync(dir, { recursive: true }) as string[])
    .filter((f) => /\.tsx?$/.test(f) && !f.endsWith('record-fields.ts'))
    .map((f) => join(dir, f));

  test('the records views hold no field literal of their own', () => {
    for (const f of ['client/src/views/records.tsx', 'client/src/views/record-forms.tsx']) {
      expect(files).toContain(f);
      expect(readFileSync(f, 'utf8'), f).not.toMatch(/\b(key|label):\s*['"`]/);
    }
  });

  test('no client module pairs a registry key with its form or table label', () => {
    const pairs = ENTITIES.flatMap((e) =>
      (RECORD_FIELDS[e] as { key: string; label: string; column?: { label?: string } }[]).flatMap(
        (f) => [f.label, f.column?.label].filter(Boolean).map((label) => [f.key, label!] as const),
      ),
    );
    expect(pairs.length).toBeGreaterThan(40);
    const esc = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
    for (const file of files) {
      const text = readFileSync(file, 'utf8');
      for (const [key, label] of pairs) {
        const pair = new RegExp(`key:\\s*['"]${esc(key)}['"][^}]*label:\\s*['"]${esc(label)}['"]`);
        expect(text, `${file}: ${key} / ${label}`).not.toMatch(pair);
      }
    }
  });
});
