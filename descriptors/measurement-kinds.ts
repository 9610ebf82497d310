/**
 * The kinds of measurement the project stores and fits, and the kinds of block that obtain them,
 * each described once. The database enum, the store's schema and checks, the CSV columns, the
 * fit's reading of a measurement, the HTTP filter and the client's form all read these tables, so
 * a new kind is one entry here plus its forward model in the fit (server/science/orbit/fit/).
 * Pure data with no imports: the server and the client both use it.
 */

/** What a block of telescope time is for: positions on the sky, or spectra. */
export const BLOCK_KINDS = ['astrometry', 'spectroscopy'] as const;
export type BlockKind = (typeof BLOCK_KINDS)[number];

/**
 * The planner's expected 1σ at the zenith of one epoch of each block kind, where neither the site
 * nor the campaign gives one: an AO-assisted astrometric epoch (per offset) and a near-infrared
 * integral-field radial velocity of a faint star (common practice, no source).
 */
export const DEFAULT_ZENITH_SIGMA = {
  astrometry: { value: 1, unit: 'mas' },
  spectroscopy: { value: 5, unit: 'km/s' },
} as const satisfies Record<BlockKind, { value: number; unit: 'mas' | 'km/s' }>;

/*
 * Physical ranges of measured values, so a typo cannot store a number that breaks every later fit
 * (an offset of 1e308 did). Offsets and separations up to 1e7 mas (2.8°): far beyond any bound
 * companion followed here. Astrometric σ from 1e-4 mas (0.1 µas, a hundred times finer than the best
 * astrometry, from memory) to 1e7 mas; radial-velocity σ from 1 mm/s.
 */
const MAX_OFFSET_MAS = 1e7;
const SIGMA_MAS = { min: 1e-4, max: MAX_OFFSET_MAS, description: 'mas, 1e-4 to 1e7' };

/** One measured quantity: its field (also its CSV column; the name ends in the unit) and its 1σ field. */
export interface MeasuredValue {
  field: string;
  sigma: string;
  unit: 'mas' | 'deg' | 'km/s';
  /** The quantity's symbol or short name, as tables print it. */
  symbol: string;
  /** Short label for forms, with the unit and sign convention. */
  label: string;
  /** What the number means, for the API document. */
  description?: string;
  /** Inclusive lower bound. */
  min?: number;
  /** Exclusive upper bound (angles). */
  below?: number;
  /** Inclusive upper bound. */
  max?: number;
  /** Inclusive bounds of the 1σ, and what they mean for the API document. */
  sigmaRange: { min: number; max: number; description: string };
}

export interface MeasurementKindDescriptor {
  /** How a person names the kind. */
  label: string;
  /** The block kind that obtains it (cadence and "last epoch" are counted per block kind). */
  blockKind: BlockKind;
  /** Its quantities in the order of the fit's residual components (their count is the row count). */
  values: readonly MeasuredValue[];
  /** Whether it may carry `correlation`, the correlation of its two quantities' errors. */
  correlated: boolean;
  /** The bodies a measurement of this kind may be of; the first is the default. */
  components: readonly MeasuredComponent[];
}

/**
 * Which body a measurement is of. `relative`: the secondary (the target) relative to the primary;
 * for a radial velocity, the star's velocity with the primary at rest (right around a compact
 * object, q → 0). `primary`, `secondary`: the velocity of that body about the barycentre, fitted
 * with the mass ratio q = M₂/M₁ (RV₁ = γ − q/(1+q)·v_rel, RV₂ = γ + v_rel/(1+q)). `photocentre`:
 * offsets of the unresolved pair's light centre from the barycentre, (β − B)·r with B = q/(1+q)
 * and β = L₂/(L₁+L₂) the light fraction, fitted with q and β.
 */
export const MEASURED_COMPONENTS = ['relative', 'primary', 'secondary', 'photocentre'] as const;
export type MeasuredComponent = (typeof MEASURED_COMPONENTS)[number];

/** What each component means, for forms and the API document. */
export const COMPONENT_TEXT: Record<MeasuredComponent, string> = {
  relative: 'secondary relative to the primary (a velocity: primary at rest)',
  primary: 'the primary about the barycentre',
  secondary: 'the secondary about the barycentre',
  photocentre: 'the light centre of the unresolved pair from the barycentre (offsets only)',
};

export const MEASUREMENT_KINDS = {
  offsets: {
    label: 'offsets Δα*, Δδ',
    blockKind: 'astrometry',
    values: [
      {
        field: 'dRaMas',
        symbol: 'Δα*',
        sigma: 'sigmaDRaMas',
        unit: 'mas',
        label: 'Δα* (mas, east +)',
        description: 'Δα* = Δα·cos δ, east positive, mas, |x| ≤ 1e7',
        min: -MAX_OFFSET_MAS,
        max: MAX_OFFSET_MAS,
        sigmaRange: SIGMA_MAS,
      },
      {
        field: 'dDecMas',
        symbol: 'Δδ',
        sigma: 'sigmaDDecMas',
        unit: 'mas',
        label: 'Δδ (mas, north +)',
        description: 'Δδ, north positive, mas, |x| ≤ 1e7',
        min: -MAX_OFFSET_MAS,
        max: MAX_OFFSET_MAS,
        sigmaRange: SIGMA_MAS,
      },
    ],
    correlated: true,
    components: ['relative', 'photocentre'],
  },
  separation: {
    label: 'separation and position angle',
    blockKind: 'astrometry',
    values: [
      {
        field: 'separationMas',
        symbol: 'separation',
        sigma: 'sigmaSeparationMas',
        unit: 'mas',
        label: 'separation (mas)',
        min: 0,
        max: MAX_OFFSET_MAS,
        sigmaRange: SIGMA_MAS,
      },
      {
        field: 'positionAngleDeg',
        symbol: 'position angle',
        sigma: 'sigmaPositionAngleDeg',
        unit: 'deg',
        label: 'position angle (°, N through E)',
        description: 'north through east, degrees',
        min: 0,
        below: 360,
        sigmaRange: { min: 1e-7, max: 180, description: 'degrees, 1e-7–180' },
      },
    ],
    correlated: true,
    components: ['relative'],
  },
  'radial-velocity': {
    label: 'radial velocity',
    blockKind: 'spectroscopy',
    values: [
      {
        field: 'radialVelocityKmS',
        symbol: 'v_r',
        sigma: 'sigmaRadialVelocityKmS',
        unit: 'km/s',
        label: 'v_r (km/s, receding +)',
        description: 'positive receding, km/s',
        min: -30_000,
        max: 30_000,
        sigmaRange: { min: 1e-6, max: 30_000, description: 'km/s, 1e-6 (1 mm/s) to 30,000' },
      },
    ],
    correlated: false,
    components: ['relative', 'primary', 'secondary'],
  },
} as const satisfies Record<string, MeasurementKindDescriptor>;

export type MeasurementKind = keyof typeof MEASUREMENT_KINDS;
/** The kind names in table order (a non-empty tuple, as enum builders want). */
export const MEASUREMENT_KIND_NAMES = Object.keys(MEASUREMENT_KINDS) as [
  MeasurementKind,
  ...MeasurementKind[],
];

export function describeKind(kind: MeasurementKind): MeasurementKindDescriptor {
  return MEASUREMENT_KINDS[kind];
}

/** Residual components a measurement of `kind` contributes to a fit. */
export function componentCount(kind: MeasurementKind): number {
  return MEASUREMENT_KINDS[kind].values.length;
}

/** How a unit is printed beside a number. */
export const UNIT_TEXT: Record<MeasuredValue['unit'], string> = {
  mas: 'mas',
  deg: '°',
  'km/s': 'km/s',
};

/** The field holding the correlation of a correlated kind's two errors. */
export const CORRELATION_FIELD = 'correlation';

type Values = (typeof MEASUREMENT_KINDS)[MeasurementKind]['values'][number];
/** A value, uncertainty or correlation field of some kind (a column of the measurements table). */
export type MeasuredField = Values['field'] | Values['sigma'] | typeof CORRELATION_FIELD;

/**
 * Every value, uncertainty and correlation field, in table order: each kind's values, then their
 * uncertainties; the correlation after the last correlated kind of a run. Columns of the
 * measurements table, of the CSV layout and of the API record follow this order.
 */
export const MEASUREMENT_VALUE_FIELDS: readonly MeasuredField[] = MEASUREMENT_KIND_NAMES.flatMap(
  (k, i): MeasuredField[] => {
    const next = MEASUREMENT_KIND_NAMES[i + 1];
    const closesRun = describeKind(k).correlated && !(next && describeKind(next).correlated);
    const correlation: MeasuredField[] = closesRun ? [CORRELATION_FIELD] : [];
    return [...fieldsOfKind(k), ...correlation];
  },
);

/** The value and uncertainty fields a measurement of `kind` must have (and no other kind may). */
export function fieldsOfKind(kind: MeasurementKind): MeasuredField[] {
  const d: { values: readonly Values[] } = MEASUREMENT_KINDS[kind];
  return [...d.values.map((v) => v.field), ...d.values.map((v) => v.sigma)];
}

/** The component a measurement of `kind` is of when none is given. */
export function defaultComponent(kind: MeasurementKind): MeasuredComponent {
  return MEASUREMENT_KINDS[kind].components[0];
}
