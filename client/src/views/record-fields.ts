/**
 * The fields of each record entity, each written once: its key, its label, the create form's input
 * and the records table's column. The forms (record-forms.tsx) and the tables (records.tsx) take
 * their lists from here, so a field added, renamed or relabelled here changes both.
 */
import { BLOCK_KINDS, DEFAULT_ZENITH_SIGMA } from '../../../descriptors/measurement-kinds.ts';
import { formatDecDms, formatRaHms } from '../../../descriptors/sexagesimal.ts';
import { scaledText } from '../lib/numbers.ts';

/** One form input. `key` is the dotted path in the request body, so server messages land beside it. */
export interface FieldSpec {
  key: string;
  label: string;
  kind: 'text' | 'number' | 'date' | 'boolean' | 'select' | 'ids' | 'mask' | 'textarea';
  /** Left out of the body when empty (the server's default applies). */
  optional?: boolean;
  initial?: string | boolean | number[];
  /** A select's options, or an `ids` field's checkboxes (value: the record's id). */
  options?: { value: string; label: string }[];
  hint?: string;
  /** Turns the typed text into the body's value (default: the text itself). */
  toValue?: (text: string) => unknown;
}

/** One table column. `key` is the row's property, also the PATCH body's field when editable. */
export interface Column {
  key: string;
  label: string;
  /** `angle`: shown and edited as sexagesimal text, sent as typed (the server reads every form). */
  editable?: 'number' | 'text' | 'boolean' | 'angle';
  /** Shown when the value is null (the default it stands for). */
  empty?: string;
  /** How a number shows (default: float noise cut, 8 significant digits). */
  format?: (v: number) => string;
}

/** The stored records a field chooses among: a select picks one (the first to start), `ids` any. */
type ChoiceList = 'systems' | 'targets' | 'sites';
type Choices = Record<ChoiceList, { id: number; name: string }[]>;

interface FormInput extends Omit<FieldSpec, 'key' | 'label'> {
  choices?: ChoiceList;
  /** The form asks this before every other field: the record it belongs to comes first. */
  first?: true;
}

/** One field of an entity: the form's input and the table's column, each present when shown. */
interface RecordField {
  key: string;
  /** The form's label, and the table's unless the column words it otherwise. */
  label: string;
  input?: FormInput;
  /** `key`: the row property shown when not the field's own (a target's system, by name). */
  column?: Omit<Column, 'key' | 'label'> & { key?: string; label?: string };
}

const DARKNESS = [
  { value: '', label: 'server default (astronomical)' },
  { value: 'astronomical', label: 'astronomical (Sun below −18°)' },
  { value: 'nautical', label: 'nautical (Sun below −12°)' },
  { value: 'civil', label: 'civil (Sun below −6°)' },
];

/** A tabled record's name: asked by its form, edited in place in its table. */
const NAME: RecordField = {
  key: 'name',
  label: 'name',
  input: { kind: 'text' },
  column: { editable: 'text' },
};
const NOTES: RecordField = {
  key: 'notes',
  label: 'notes',
  input: { kind: 'textarea', optional: true },
};

/** A number the form may leave empty (the server's default applies); not a table column. */
const optionalNumber = (key: string, label: string): RecordField => ({
  key,
  label,
  input: { kind: 'number', optional: true },
});

/** Each entity's fields in the order the form and the table show them. */
export const RECORD_FIELDS = {
  systems: [
    NAME,
    // As a catalogue writes them: RA to 0.01 s and Dec to 0.1″ (0.15″ at most, finer than any pointing).
    {
      key: 'raDeg',
      label: 'RA (°, ICRS)',
      input: { kind: 'number' },
      column: { label: 'RA (h:m:s, ICRS)', editable: 'angle', format: (v) => formatRaHms(v) },
    },
    {
      key: 'decDeg',
      label: 'Dec (°, ICRS)',
      input: { kind: 'number' },
      column: { label: 'Dec (°:′:″, ICRS)', editable: 'angle', format: (v) => formatDecDms(v) },
    },
    {
      key: 'positionEpoch',
      label: 'position epoch',
      input: {
        kind: 'text',
        optional: true,
        hint: 'e.g. J2016.0, an ISO 8601 instant, JD or MJD; default J2000.0',
      },
    },
    optionalNumber('pmRaMasYr', 'μα* (mas/yr)'),
    optionalNumber('pmDecMasYr', 'μδ (mas/yr)'),
    {
      key: 'distancePc',
      label: 'distance (pc)',
      input: { kind: 'number', optional: true },
      column: { editable: 'number' },
    },
    {
      key: 'massSolar',
      label: 'mass (M☉)',
      input: { kind: 'number', optional: true },
      column: { editable: 'number', format: (v) => scaledText(v) },
    },
    NOTES,
  ],
  targets: [
    NAME,
    {
      key: 'systemId',
      label: 'system',
      input: { kind: 'select', choices: 'systems', toValue: Number, first: true },
      column: { key: 'systemName' },
    },
    {
      key: 'magnitude',
      label: 'magnitude',
      input: { kind: 'number', optional: true },
      column: { editable: 'number' },
    },
    {
      key: 'band',
      label: 'band',
      input: { kind: 'text', optional: true, hint: 'e.g. K, H, V' },
      column: { editable: 'text' },
    },
    NOTES,
  ],
  sites: [
    NAME,
    {
      key: 'latitudeDeg',
      label: 'latitude (°, N +)',
      input: { kind: 'number' },
      column: { editable: 'number' },
    },
    {
      key: 'longitudeDeg',
      label: 'longitude (°, E +)',
      input: { kind: 'number' },
      column: { editable: 'number' },
    },
    {
      key: 'elevationM',
      label: 'elevation (m)',
      input: { kind: 'number' },
      column: { editable: 'number' },
    },
    {
      key: 'timeZone',
      label: 'time zone (IANA)',
      input: { kind: 'text', hint: 'e.g. America/Santiago' },
      column: { editable: 'text' },
    },
    {
      key: 'lowestAltitudeDeg',
      label: 'lowest altitude (°)',
      input: { kind: 'number', optional: true },
      column: { editable: 'number' },
    },
    {
      key: 'leastSunDistanceDeg',
      label: 'least Sun distance (°)',
      input: {
        kind: 'number',
        optional: true,
        hint: 'default 45°; follow the site’s own interlock if stricter',
      },
      column: { editable: 'number' },
    },
    optionalNumber('pressureHpa', 'pressure (hPa)'),
    optionalNumber('temperatureC', 'temperature (°C)'),
    {
      key: 'humidityPct',
      label: 'humidity (%)',
      input: { kind: 'number', optional: true, hint: 'for refraction; default 50 %' },
    },
    {
      key: 'wavelengthUm',
      label: 'wavelength (µm)',
      input: {
        kind: 'number',
        optional: true,
        hint: 'band observed, for refraction: K 2.2, H 1.65, J 1.25, V 0.55; default 2.2',
      },
    },
    {
      key: 'horizonMask',
      label: 'horizon mask',
      input: {
        kind: 'mask',
        optional: true,
        hint: 'pairs “azimuth altitude” in degrees, separated by commas, e.g. 0 8, 170 34, 260 7',
      },
    },
    {
      key: 'laserGuideStar',
      label: 'laser guide star',
      input: { kind: 'boolean' },
      column: { editable: 'boolean' },
    },
    // The planner's precision model for the site; empty fields take its defaults.
    {
      key: 'astrometrySigmaMas',
      label: 'astrometry σ at zenith (mas)',
      column: {
        editable: 'number',
        empty: `${DEFAULT_ZENITH_SIGMA.astrometry.value} (default)`,
      },
    },
    {
      key: 'spectroscopySigmaKmS',
      label: 'RV σ at zenith (km/s)',
      column: {
        editable: 'number',
        empty: `${DEFAULT_ZENITH_SIGMA.spectroscopy.value} (default)`,
      },
    },
    {
      key: 'referenceSeeingArcsec',
      label: 'σ holds for seeing (″)',
      column: { editable: 'number', empty: 'any (default)' },
    },
    NOTES,
  ],
  // Campaigns have no table on the records page: their fields are the form's only.
  campaigns: [
    { key: 'name', label: 'name', input: { kind: 'text' } },
    { key: 'startDate', label: 'first night', input: { kind: 'date' } },
    { key: 'endDate', label: 'last night', input: { kind: 'date' } },
    { key: 'goals.cadenceDays', label: 'cadence (days)', input: { kind: 'number' } },
    {
      key: 'goals.kinds',
      label: 'measurements',
      input: {
        kind: 'select',
        initial: 'astrometry',
        options: [
          ...BLOCK_KINDS.map((k) => ({ value: k, label: k })),
          { value: 'both', label: BLOCK_KINDS.join(' and ') },
        ],
        toValue: (s) => (s === 'both' ? [...BLOCK_KINDS] : [s]),
      },
    },
    optionalNumber('goals.densifiedCadenceDays', 'cadence near periapsis (days)'),
    optionalNumber('goals.densifyWithinDays', 'near periapsis means within (days)'),
    {
      key: 'goals.wavelengthUm',
      label: 'wavelength (µm)',
      input: {
        kind: 'number',
        optional: true,
        hint: 'band observed, for refraction: K 2.2, J 1.25, V 0.55; empty: each site’s own',
      },
    },
    optionalNumber('limits.highestAirmass', 'highest airmass'),
    optionalNumber('limits.leastMoonDistanceDeg', 'least Moon distance (°)'),
    {
      key: 'limits.darkness',
      label: 'darkness',
      input: { kind: 'select', optional: true, options: DARKNESS, initial: '' },
    },
    { key: 'targetIds', label: 'targets', input: { kind: 'ids', choices: 'targets' } },
    { key: 'siteIds', label: 'sites', input: { kind: 'ids', choices: 'sites' } },
    NOTES,
  ],
} satisfies Record<string, RecordField[]>;

export type RecordEntity = keyof typeof RECORD_FIELDS;

/** The create form's inputs of an entity, with the stored records its choosing fields offer. */
export function formFields(entity: RecordEntity, stored: Choices): FieldSpec[] {
  const fields: RecordField[] = RECORD_FIELDS[entity];
  const asked = fields.filter((f) => f.input);
  const ordered = [...asked.filter((f) => f.input!.first), ...asked.filter((f) => !f.input!.first)];
  return ordered.map(({ key, label, input }) => {
    const { choices, first: _first, ...spec } = input!;
    if (!choices) return { key, label, ...spec };
    const options = stored[choices].map((r) => ({ value: String(r.id), label: r.name }));
    const initial = spec.kind === 'ids' ? [] : (options[0]?.value ?? '');
    return { key, label, ...spec, options, initial };
  });
}

/** The records table's columns of an entity. */
export function tableColumns(entity: RecordEntity): Column[] {
  const fields: RecordField[] = RECORD_FIELDS[entity];
  return fields.flatMap(({ key, label, column }) =>
    column ? [{ ...column, key: column.key ?? key, label: column.label ?? label }] : [],
  );
}
