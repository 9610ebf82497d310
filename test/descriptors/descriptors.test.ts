/**
 * The measurement-kind and role descriptors (descriptors/) are the one list: the database table, the
 * store's schema, the CSV layout, the fit and the user schema all follow them. A kind added to the
 * descriptor without its column (a migration) fails here.
 */
import { getTableColumns } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { measurements, users } from '../../db/schema.ts';
import { readMeasurements } from '../../server/science/orbit/fit/measurements.ts';
import type { MeasurementInput } from '../../server/science/orbit/fit/types.ts';
import { MEASUREMENT_COLUMNS, MeasurementFields, UserInput } from '../../server/store/index.ts';
import {
  MEASUREMENT_KIND_NAMES,
  MEASUREMENT_KINDS,
  MEASUREMENT_VALUE_FIELDS,
  componentCount,
  fieldsOfKind,
  type MeasurementKind,
} from '../../descriptors/measurement-kinds.ts';
import { ROLE_NAMES, roleAtLeast } from '../../descriptors/roles.ts';

// The fit's typed inputs name exactly the descriptor's kinds (a compile-time check both ways).
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const fitKindsMatch: Same<MeasurementInput['kind'], MeasurementKind> = true;

describe('measurement kinds', () => {
  it('are the stored enum and the fit’s input kinds', () => {
    expect(fitKindsMatch).toBe(true);
    expect(getTableColumns(measurements).kind.enumValues).toEqual(MEASUREMENT_KIND_NAMES);
    expect(MeasurementFields.shape.kind.options).toEqual(MEASUREMENT_KIND_NAMES);
  });

  it('have one column per value field, in order, each named with its unit', () => {
    const columns = Object.keys(getTableColumns(measurements));
    const start = columns.indexOf('epochJd') + 1;
    expect(columns.slice(start, start + MEASUREMENT_VALUE_FIELDS.length)).toEqual([
      ...MEASUREMENT_VALUE_FIELDS,
    ]);
    expect(new Set(MEASUREMENT_VALUE_FIELDS).size).toBe(MEASUREMENT_VALUE_FIELDS.length);
    for (const d of Object.values(MEASUREMENT_KINDS))
      for (const v of d.values) {
        // Units in names (DEVELOPERS.md, Conventions): …Mas, …Deg, …KmS.
        const suffix = { mas: 'Mas', deg: 'Deg', 'km/s': 'KmS' }[v.unit];
        expect([v.field.endsWith(suffix), v.sigma.endsWith(suffix)], v.field).toEqual([true, true]);
      }
  });

  it('give the store schema and the CSV layout their fields', () => {
    const keys = Object.keys(MeasurementFields.shape);
    for (const f of MEASUREMENT_VALUE_FIELDS) {
      expect(keys, f).toContain(f);
      expect(MEASUREMENT_COLUMNS, f).toContain(f);
    }
  });

  it('give the fit one residual component per value', () => {
    // A radial velocity is one number; a position on the sky two (common practice, no source).
    expect(MEASUREMENT_KIND_NAMES.map(componentCount)).toEqual([2, 2, 1]);
    for (const kind of MEASUREMENT_KIND_NAMES) {
      const m = Object.fromEntries(fieldsOfKind(kind).map((f) => [f, 1]));
      const [obs] = readMeasurements([{ kind, epoch: 2461000.5, ...m }], 'm');
      expect(obs!.kind).toBe(kind);
    }
    expect(() => readMeasurements([{ kind: 'parallax', epoch: 2461000.5 }], 'm')).toThrow(
      /must be "offsets", "separation" or "radial-velocity"/,
    );
  });
});

describe('roles', () => {
  it('are the stored enum and the user schema, lowest first', () => {
    expect(getTableColumns(users).role.enumValues).toEqual(ROLE_NAMES);
    expect(UserInput.shape.role.options).toEqual(ROLE_NAMES);
    expect(ROLE_NAMES).toEqual(['viewer', 'observer', 'lead']);
    expect([roleAtLeast('lead', 'observer'), roleAtLeast('viewer', 'observer')]).toEqual([
      true,
      false,
    ]);
  });
});
