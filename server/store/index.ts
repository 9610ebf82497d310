/**
 * The campaign store: one repository per entity over one libSQL database, and the views and
 * exports built on them. This module is the store's only door: http, cli and client code import
 * from here and never see the database handle, drizzle or db/schema.ts.
 */
export { createStore, type Store } from './store.ts';
export {
  displayUrl,
  filePath,
  locateDatabase,
  openDatabase,
  resolveDatabaseUrl,
  type Database,
  type DatabaseSource,
  type OpenOptions,
} from './database.ts';
export { startStore, type StartOptions, type Started } from './startup.ts';
export {
  LOCAL_OPERATOR,
  commandLineActor,
  tokenActor,
  type Actor,
  type AuditVia,
} from './audit.ts';
export type { AuditFilter, AuditRow } from './repos/audit.ts';
export { ConflictError, NotFoundError } from './errors.ts';
export type { Page, PageRequest } from './crud.ts';
export type { Repository } from './repository.ts';
export { AUDIT_VIA, BLOCK_ORIGINS, BLOCK_STATUSES } from '../../db/schema.ts';
export {
  BlockFields,
  CampaignFields,
  MeasurementFields,
  NightFields,
  NightReportFields,
  OrbitSolutionInput,
  SiteFields,
  SystemFields,
  TargetFields,
  UserInput,
  type Role,
} from './schemas/entities.ts';
export type { CampaignFilter, CampaignRow, CampaignView } from './repos/campaigns.ts';
export type { SystemFilter, SystemRow, TargetFilter, TargetRow } from './repos/catalogue.ts';
export type { MeasurementFilter, MeasurementRow } from './repos/measurements.ts';
export type { BlockFilter, BlockRow, NightFilter, NightRow } from './repos/nights.ts';
export type { OrbitSolutionFilter, OrbitSolutionRow } from './repos/orbits.ts';
export type { NightReportFilter, NightReportRow, NightReportView } from './repos/reports.ts';
export type { SiteRow } from './repos/sites.ts';
export type { ClearPriorView, MonthPrior } from './repos/clear-priors.ts';
export type { SiteStatisticsView } from './views/site-statistics.ts';
export type { IssuedToken, TokenListing, UserRow } from './repos/users.ts';
export { ACCEPT_AT_TOLERANCE_MINUTES } from './views/plan-scope.ts';
export {
  DEFAULT_WEATHER,
  NIGHT_CHOICES,
  WEATHER_CHOICES,
  type SeasonPlanRequest,
  type WeatherChoice,
} from './views/season-plan.ts';
export type { SeasonDrawsRequest, SeasonDrawsView } from './views/season-draws.ts';
export type { ReplanPreview, ReplanRequest } from './views/replan.ts';
export type { TimeRequestInput } from './views/time-request.ts';
export type { NightScheduleRequest } from './views/night-plan.ts';
export { skyOfRows, type SkyMember, type StoredSky } from './views/visibility.ts';
export type {
  AllocationNight,
  AllocationPreview,
  AllocationRequest,
} from './allocations/allocate.ts';
export { MOST_NIGHTS_PER_REQUEST } from './allocations/sources.ts';
export type { StoredFitOptions } from './fits.ts';
export {
  COLUMNS,
  CSV_KINDS,
  MEASUREMENT_COLUMNS,
  NUMERIC,
  REQUIRED_COLUMNS,
  type CsvKind,
} from './csv/columns.ts';
export { ImportRejected, type ImportReport } from './csv/import.ts';
export { escapeFormulaCell } from './csv/cells.ts';
export {
  CLEAR_PRIOR_COLUMNS,
  DEFAULT_PRIOR_STRENGTH_NIGHTS,
  readClearPriorCsv,
} from './csv/clear-prior.ts';
export type { PreparedMeasurements } from './csv/measurement-rows.ts';
export { ephemerisCsv } from './exports/ephemeris.ts';
export { SITE_TOTAL, timeRequestCsv } from './exports/time-request.ts';
export { RESIDUAL_CSV_COLUMNS, residualsCsv } from './exports/residuals.ts';
export { measurementsCsv, type ExportedMeasurement } from './exports/measurements.ts';
export { orbitsCsv, type ExportedOrbit } from './exports/orbits.ts';
