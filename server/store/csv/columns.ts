/**
 * The CSV layouts of targets, orbit solutions and measurements: the same columns are written by
 * the exports and read by the imports, so an export can be edited in a spreadsheet and read back.
 * Header names are the JSON field names; `system` and `target` are names, not ids.
 */
import { CORRELATIONS_COLUMN, SIGMA_COLUMNS } from '../../../descriptors/covariance.ts';
import { MEASUREMENT_VALUE_FIELDS } from '../../../descriptors/measurement-kinds.ts';

export const CSV_KINDS = ['targets', 'orbits', 'measurements'] as const;
export type CsvKind = (typeof CSV_KINDS)[number];

export const TARGET_COLUMNS = ['system', 'name', 'magnitude', 'band', 'notes'] as const;

export const ORBIT_COLUMNS = [
  'system',
  'target',
  'kind',
  'periodYears',
  'periapsis',
  'eccentricity',
  'semiMajorAxisArcsec',
  'inclinationDeg',
  'ascendingNodeDeg',
  'argPeriapsisDeg',
  'aArcsec',
  'bArcsec',
  'fArcsec',
  'gArcsec',
  'distancePc',
  'systemicVelocityKmS',
  'massRatio',
  'lightFraction',
  ...SIGMA_COLUMNS,
  CORRELATIONS_COLUMN,
  'relativity',
  'redshiftFactor',
  'precessionFactor',
  'reference',
  'notes',
  'makeCurrent',
] as const;

/** The measurement layout: identity, then every kind's value fields (the descriptors' order), then the rest. */
export const MEASUREMENT_COLUMNS: readonly string[] = [
  'system',
  'target',
  'kind',
  'component',
  'epoch',
  ...MEASUREMENT_VALUE_FIELDS,
  'instrument',
  'blockId',
  'notes',
];

export const COLUMNS: Record<CsvKind, readonly string[]> = {
  targets: TARGET_COLUMNS,
  orbits: ORBIT_COLUMNS,
  measurements: MEASUREMENT_COLUMNS,
};

/** Which columns are required in the header (others may be left out entirely). */
export const REQUIRED_COLUMNS: Record<CsvKind, readonly string[]> = {
  targets: ['system', 'name'],
  orbits: ['system', 'target', 'periodYears', 'periapsis', 'eccentricity'],
  measurements: ['system', 'target', 'kind', 'epoch', 'instrument'],
};

/** A column whose name ends in its unit holds a number, as do the dimensionless ones listed here. */
const NUMBER_BY_NAME =
  /(Years|Arcsec|Deg|Pc|KmS|Mas|Days)$|^(eccentricity|massRatio|lightFraction|correlation|magnitude|blockId|redshiftFactor|precessionFactor)$|^sigma(Eccentricity|MassRatio|LightFraction)$/;

/** Columns read as numbers (a cell that is not a number is reported as it is). */
export const NUMERIC: ReadonlySet<string> = new Set<string>(
  [...TARGET_COLUMNS, ...ORBIT_COLUMNS, ...MEASUREMENT_COLUMNS].filter((c) =>
    NUMBER_BY_NAME.test(c),
  ),
);
