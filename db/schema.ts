/**
 * The campaign store's schema: camelCase keys in TypeScript, snake_case columns in SQL.
 * Instants are ISO 8601 UTC strings (`…Z`); night dates are the local evening date `YYYY-MM-DD`.
 * JSON columns hold structures that are read and written whole (orbit elements, goals).
 */
import { sql } from 'drizzle-orm';
import {
  index,
  integer,
  primaryKey,
  real,
  sqliteTable,
  text,
  uniqueIndex,
} from 'drizzle-orm/sqlite-core';
import {
  BLOCK_KINDS,
  MEASUREMENT_KIND_NAMES,
  MEASURED_COMPONENTS,
  type BlockKind,
} from '../descriptors/measurement-kinds.ts';
import { ROLE_NAMES } from '../descriptors/roles.ts';
import type { OrbitInput } from '../server/science/orbit/types.ts';
import type { HorizonPoint } from '../server/science/sky/site.ts';

/** J2000.0 (JD 2451545.0) as the store writes instants; the default epoch of a catalogue position. */
export const J2000_ISO = '2000-01-01T12:00:00.000Z';

const created = () => text('created_at').notNull();
const updated = () => text('updated_at').notNull();

export const users = sqliteTable('users', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  name: text('name').notNull().unique(),
  role: text('role', { enum: ROLE_NAMES }).notNull(),
  createdAt: created(),
});

/** Bearer tokens, stored as SHA-256 hex of the secret: the secret itself is shown once and never kept. */
export const tokens = sqliteTable('tokens', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  userId: integer('user_id')
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  hash: text('hash').notNull().unique(),
  label: text('label').notNull(),
  createdAt: created(),
  revokedAt: text('revoked_at'),
  /** A read-only token that opens one campaign's calendar feed and nothing else (null: a user's token). */
  feedCampaignId: integer('feed_campaign_id').references(() => campaigns.id),
});

export const systems = sqliteTable('systems', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  name: text('name').notNull().unique(),
  raDeg: real('ra_deg').notNull(),
  decDeg: real('dec_deg').notNull(),
  pmRaMasYr: real('pm_ra_mas_yr').notNull().default(0),
  pmDecMasYr: real('pm_dec_mas_yr').notNull().default(0),
  /**
   * Epoch of raDeg/decDeg (ISO 8601 UTC); proper motion carries the position from here. J2000.0 for
   * rows older than the column.
   */
  positionEpoch: text('position_epoch').notNull().default(J2000_ISO),
  distancePc: real('distance_pc'),
  massSolar: real('mass_solar'),
  notes: text('notes').notNull().default(''),
  createdAt: created(),
  updatedAt: updated(),
});

export const targets = sqliteTable(
  'targets',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    systemId: integer('system_id')
      .notNull()
      .references(() => systems.id, { onDelete: 'restrict' }),
    name: text('name').notNull(),
    magnitude: real('magnitude'),
    band: text('band'),
    notes: text('notes').notNull().default(''),
    createdAt: created(),
    updatedAt: updated(),
  },
  (t) => [uniqueIndex('targets_system_name').on(t.systemId, t.name)],
);

/** Immutable versions; exactly one per target has `current = 1` (a partial unique index keeps it so). */
export const orbitSolutions = sqliteTable(
  'orbit_solutions',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    targetId: integer('target_id')
      .notNull()
      .references(() => targets.id, { onDelete: 'restrict' }),
    version: integer('version').notNull(),
    current: integer('current', { mode: 'boolean' }).notNull(),
    orbit: text('orbit', { mode: 'json' }).$type<OrbitInput>().notNull(),
    provenance: text('provenance', { enum: ['entered', 'imported', 'fitted'] }).notNull(),
    /** Measurement ids the fit used (provenance `fitted`). */
    fittedFrom: text('fitted_from', { mode: 'json' }).$type<number[]>(),
    reference: text('reference').notNull().default(''),
    notes: text('notes').notNull().default(''),
    createdBy: integer('created_by').references(() => users.id),
    createdAt: created(),
  },
  (t) => [
    uniqueIndex('orbit_solutions_target_version').on(t.targetId, t.version),
    uniqueIndex('orbit_solutions_one_current').on(t.targetId).where(sql`current = 1`),
  ],
);

export const sites = sqliteTable('sites', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  name: text('name').notNull().unique(),
  latitudeDeg: real('latitude_deg').notNull(),
  longitudeDeg: real('longitude_deg').notNull(),
  elevationM: real('elevation_m').notNull(),
  timeZone: text('time_zone').notNull(),
  /** The longitude and the zone disagree by more than a few hours, and a lead confirmed it is meant. */
  longitudeZoneConfirmed: integer('longitude_zone_confirmed', { mode: 'boolean' })
    .notNull()
    .default(false),
  lowestAltitudeDeg: real('lowest_altitude_deg').notNull().default(30),
  leastSunDistanceDeg: real('least_sun_distance_deg').notNull().default(45),
  pressureHpa: real('pressure_hpa'),
  temperatureC: real('temperature_c'),
  /** Relative humidity for refraction, %; null: 50 %. */
  humidityPct: real('humidity_pct'),
  /** Wavelength refraction is computed at, µm (the band observed); null: 2.2 µm. */
  wavelengthUm: real('wavelength_um'),
  /** Azimuth-dependent horizon (the sky engine's shape), sorted by azimuth; empty for a flat horizon. */
  horizonMask: text('horizon_mask', { mode: 'json' })
    .$type<HorizonPoint[]>()
    .notNull()
    .default(sql`'[]'`),
  laserGuideStar: integer('laser_guide_star', { mode: 'boolean' }).notNull().default(false),
  /** Expected 1σ of each astrometric offset at the zenith, mas; null: the planner's default. */
  astrometrySigmaMas: real('astrometry_sigma_mas'),
  /** Expected 1σ of a radial velocity at the zenith, km/s; null: the planner's default. */
  spectroscopySigmaKmS: real('spectroscopy_sigma_km_s'),
  /** Seeing FWHM the two zenith values hold for, arcsec; null: the night's own seeing. */
  referenceSeeingArcsec: real('reference_seeing_arcsec'),
  notes: text('notes').notNull().default(''),
  createdAt: created(),
  updatedAt: updated(),
});

/**
 * A site's prior for each calendar month: the share of night time the user expects to be clear and
 * how many nights of log that belief is worth (science/plan/site-statistics.ts combines it with the
 * log). Replaced whole, one row per month that has one.
 */
export const siteClearPriors = sqliteTable(
  'site_clear_priors',
  {
    siteId: integer('site_id')
      .notNull()
      .references(() => sites.id, { onDelete: 'cascade' }),
    /** Calendar month, 1–12. */
    month: integer('month').notNull(),
    clearFraction: real('clear_fraction').notNull(),
    strengthNights: real('strength_nights').notNull(),
    updatedAt: updated(),
  },
  (t) => [primaryKey({ columns: [t.siteId, t.month] })],
);

export interface CampaignGoals {
  /** Wanted interval between epochs of a target, days. */
  cadenceDays: number;
  /** Wavelength the campaign observes at, µm, for refraction; absent: each site's own. */
  wavelengthUm?: number;
  /** Interval near periapsis, days, used within `densifyWithinDays` of a passage. */
  densifiedCadenceDays?: number;
  densifyWithinDays?: number;
  kinds: BlockKind[];
  /** Block length per kind, minutes. */
  blockMinutes?: PerKindGoal<number>;
  /** Laser guide star use per kind where a site has one (absent: none). */
  laserGuideStar?: PerKindGoal<boolean>;
  /** Epochs per night inside a periapsis window. */
  periapsisRepeat?: 'single' | 'fill' | { step: string };
  /** Also maximise the relativity forecast of targets with the terms on (default false). */
  relativityGoal?: boolean;
  /** Half-width of the periapsis window in σ of the passage date (default 2). */
  periapsisWindowSigma?: number;
  /** An epoch within this many days of the passage date covers it (default 1). */
  coverageWithinDays?: number;
  /** The campaign's precision model (zenith values; overrides each site's). */
  precision?: { astrometryMas?: number; spectroscopyKmS?: number; referenceSeeingArcsec?: number };
  /** Per-target settings by target id (each defaults to the campaign's). */
  targets?: Record<
    string,
    {
      priority?: number;
      cadenceDays?: number;
      blockMinutes?: PerKindGoal<number>;
      laserGuideStar?: PerKindGoal<boolean>;
      periapsisRepeat?: 'single' | 'fill' | { step: string };
    }
  >;
}
export type PerKindGoal<T> = { astrometry?: T; spectroscopy?: T };
export interface CampaignLimits {
  highestAirmass?: number;
  leastMoonDistanceDeg?: number;
  darkness?: 'civil' | 'nautical' | 'astronomical';
}

export const campaigns = sqliteTable('campaigns', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  name: text('name').notNull().unique(),
  startDate: text('start_date').notNull(),
  endDate: text('end_date').notNull(),
  goals: text('goals', { mode: 'json' }).$type<CampaignGoals>().notNull(),
  limits: text('limits', { mode: 'json' }).$type<CampaignLimits>().notNull(),
  notes: text('notes').notNull().default(''),
  createdAt: created(),
  updatedAt: updated(),
});

export const campaignTargets = sqliteTable(
  'campaign_targets',
  {
    campaignId: integer('campaign_id')
      .notNull()
      .references(() => campaigns.id, { onDelete: 'cascade' }),
    targetId: integer('target_id')
      .notNull()
      .references(() => targets.id, { onDelete: 'restrict' }),
  },
  (t) => [primaryKey({ columns: [t.campaignId, t.targetId] })],
);

export const campaignSites = sqliteTable(
  'campaign_sites',
  {
    campaignId: integer('campaign_id')
      .notNull()
      .references(() => campaigns.id, { onDelete: 'cascade' }),
    siteId: integer('site_id')
      .notNull()
      .references(() => sites.id, { onDelete: 'restrict' }),
  },
  (t) => [primaryKey({ columns: [t.campaignId, t.siteId] })],
);

export const nights = sqliteTable(
  'nights',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    siteId: integer('site_id')
      .notNull()
      .references(() => sites.id, { onDelete: 'restrict' }),
    campaignId: integer('campaign_id').references(() => campaigns.id, { onDelete: 'restrict' }),
    date: text('date').notNull(),
    /** The label of the allocation the night came with (a semester, a run), '' when none. */
    semester: text('semester').notNull().default(''),
    notes: text('notes').notNull().default(''),
    createdAt: created(),
    updatedAt: updated(),
  },
  (t) => [
    uniqueIndex('nights_site_date').on(t.siteId, t.date),
    index('nights_campaign').on(t.campaignId),
  ],
);

export const BLOCK_STATUSES = ['planned', 'obtained', 'partial', 'lost', 'withdrawn'] as const;
/** Who made a block: an accepted season plan, an accepted night schedule, or a person (HTTP, CLI). */
export const BLOCK_ORIGINS = ['season-plan', 'night-schedule', 'by-hand'] as const;

export const blocks = sqliteTable(
  'blocks',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    nightId: integer('night_id')
      .notNull()
      .references(() => nights.id, { onDelete: 'restrict' }),
    targetId: integer('target_id')
      .notNull()
      .references(() => targets.id, { onDelete: 'restrict' }),
    kind: text('kind', { enum: BLOCK_KINDS }).notNull(),
    startUtc: text('start_utc').notNull(),
    endUtc: text('end_utc').notNull(),
    status: text('status', { enum: BLOCK_STATUSES }).notNull().default('planned'),
    laserGuideStar: integer('laser_guide_star', { mode: 'boolean' }).notNull().default(false),
    /**
     * Set once, when the block is written. Rows older than the column are 'by-hand' unless their
     * notes show a plan wrote them (migration 0002).
     */
    origin: text('origin', { enum: BLOCK_ORIGINS }).notNull().default('by-hand'),
    /** A person fixed this block where it is: no accepted plan replaces it. */
    pinned: integer('pinned', { mode: 'boolean' }).notNull().default(false),
    /** Why this block may overlap another block of its site (null: it may not). Migration 0005. */
    overlapReason: text('overlap_reason'),
    notes: text('notes').notNull().default(''),
    version: integer('version').notNull().default(1),
    createdAt: created(),
    updatedAt: updated(),
  },
  (t) => [index('blocks_night').on(t.nightId), index('blocks_target').on(t.targetId)],
);

export const nightReports = sqliteTable('night_reports', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  nightId: integer('night_id')
    .notNull()
    .unique()
    .references(() => nights.id, { onDelete: 'restrict' }),
  seeingArcsec: real('seeing_arcsec'),
  strehlRatio: real('strehl_ratio'),
  cloudCoverPct: real('cloud_cover_pct'),
  humidityPct: real('humidity_pct'),
  windMS: real('wind_m_s'),
  temperatureC: real('temperature_c'),
  timeLostHours: real('time_lost_hours').notNull().default(0),
  timeLostReason: text('time_lost_reason').notNull().default(''),
  notes: text('notes').notNull().default(''),
  authorId: integer('author_id').references(() => users.id),
  version: integer('version').notNull().default(1),
  createdAt: created(),
  updatedAt: updated(),
});

/** What became of one block, written with the night report (one per block). */
export const blockOutcomes = sqliteTable('block_outcomes', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  reportId: integer('report_id')
    .notNull()
    .references(() => nightReports.id, { onDelete: 'cascade' }),
  blockId: integer('block_id')
    .notNull()
    .unique()
    .references(() => blocks.id, { onDelete: 'restrict' }),
  status: text('status', { enum: BLOCK_STATUSES }).notNull(),
  /** The block's status before the report set it; deleting the report restores it (null: `planned`). */
  previousStatus: text('previous_status', { enum: BLOCK_STATUSES }),
  exposureMinutes: real('exposure_minutes'),
  notes: text('notes').notNull().default(''),
});

/**
 * The columns of a measurement after its target and block: one list for the table and for the
 * staging table an import fills before it swaps its rows in.
 */
const measurementColumns = () => ({
  kind: text('kind', { enum: MEASUREMENT_KIND_NAMES }).notNull(),
  /** Which body: the secondary relative to the primary (the default), the primary or the secondary. */
  component: text('component', { enum: MEASURED_COMPONENTS }).notNull().default('relative'),
  epoch: text('epoch').notNull(),
  epochJd: real('epoch_jd').notNull(),
  dRaMas: real('d_ra_mas'),
  dDecMas: real('d_dec_mas'),
  sigmaDRaMas: real('sigma_d_ra_mas'),
  sigmaDDecMas: real('sigma_d_dec_mas'),
  separationMas: real('separation_mas'),
  positionAngleDeg: real('position_angle_deg'),
  sigmaSeparationMas: real('sigma_separation_mas'),
  sigmaPositionAngleDeg: real('sigma_position_angle_deg'),
  correlation: real('correlation'),
  radialVelocityKmS: real('radial_velocity_km_s'),
  sigmaRadialVelocityKmS: real('sigma_radial_velocity_km_s'),
  instrument: text('instrument').notNull(),
  notes: text('notes').notNull().default(''),
  createdAt: created(),
  updatedAt: updated(),
});

export const measurements = sqliteTable(
  'measurements',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    targetId: integer('target_id')
      .notNull()
      .references(() => targets.id, { onDelete: 'restrict' }),
    blockId: integer('block_id').references(() => blocks.id, { onDelete: 'set null' }),
    ...measurementColumns(),
  },
  (t) => [
    index('measurements_target_epoch').on(t.targetId, t.epochJd),
    index('measurements_block').on(t.blockId),
  ],
);

/**
 * A measurements import under way: its rows are staged in batches (short write transactions) and
 * moved into `measurements` in one last transaction, so no reader sees part of a file. A run whose
 * process has ended (same host, pid gone or a new process under its pid) or whose heartbeat is
 * older than the lease is abandoned, and its staged rows are deleted (csv/staging.ts).
 */
export const importRuns = sqliteTable('import_runs', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  host: text('host').notNull(),
  pid: integer('pid').notNull(),
  /** A random id of the writing process, told apart from a later process under the same pid. */
  owner: text('owner').notNull(),
  startedAt: text('started_at').notNull(),
  heartbeatAt: text('heartbeat_at').notNull(),
  /** Set when the rows were moved in: the staged copies are then only left to delete. */
  finishedAt: text('finished_at'),
});

/** Staged rows of an import run, in file order (rowid); no references, checked again at the swap. */
export const measurementStaging = sqliteTable('measurement_staging', {
  runId: integer('run_id')
    .notNull()
    .references(() => importRuns.id, { onDelete: 'cascade' }),
  targetId: integer('target_id').notNull(),
  blockId: integer('block_id'),
  ...measurementColumns(),
});

/** How a change reached the store. */
export const AUDIT_VIA = ['http', 'cli', 'store'] as const;

export const auditTrail = sqliteTable(
  'audit_trail',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    at: text('at').notNull(),
    userId: integer('user_id').references(() => users.id, { onDelete: 'set null' }),
    /** The writer's name when it wrote: the user's, or the operating-system account at the command line. */
    actorName: text('actor_name'),
    /** How the change came: the HTTP API, the command line, or the store itself (demo, start-up). */
    via: text('via', { enum: AUDIT_VIA }),
    /** The bearer token of an HTTP write (or of a command line acting through a server). */
    tokenId: integer('token_id').references(() => tokens.id, { onDelete: 'set null' }),
    action: text('action', { enum: ['create', 'update', 'delete', 'import'] }).notNull(),
    entity: text('entity').notNull(),
    entityId: integer('entity_id'),
    detail: text('detail', { mode: 'json' }).$type<unknown>(),
  },
  (t) => [index('audit_entity').on(t.entity, t.entityId)],
);
