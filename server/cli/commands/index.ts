/** Every CLI subcommand, by name. Add a command: one module in this folder, one line here. */
import type { Command } from '../io.ts';
import { ephemerisCommand } from './ephemeris.ts';
import { eventsCommand } from './events.ts';
import { nightCommand } from './night.ts';
import { seasonCommand } from './season.ts';
import { accountCommand } from './account.ts';
import { backupCommand } from './backup.ts';
import { restoreCommand } from './restore.ts';
import { importCommand } from './import.ts';
import { exportCommand } from './export.ts';
import { flagsCommand } from './flags.ts';
import { planNightCommand } from './plan-night.ts';
import { planSeasonCommand } from './plan-season.ts';
import { fitCommand } from './fit.ts';
import { forecastCommand } from './forecast.ts';
import { sitePrecisionCommand } from './site-precision.ts';
import { siteStatisticsCommand } from './site-statistics.ts';
import { replanCommand } from './replan.ts';
import { timeRequestCommand } from './time-request.ts';
import { allocateCommand } from './allocate.ts';
import { createDatabaseCommand } from './create-database.ts';
import {
  blockCommand,
  campaignCommand,
  measurementCommand,
  reportCommand,
  siteCommand,
  systemCommand,
  targetCommand,
} from './records.ts';

export const commands: Record<string, Command> = {
  'create-database': createDatabaseCommand,
  system: systemCommand,
  target: targetCommand,
  site: siteCommand,
  campaign: campaignCommand,
  allocate: allocateCommand,
  block: blockCommand,
  report: reportCommand,
  measurement: measurementCommand,
  ephemeris: ephemerisCommand,
  events: eventsCommand,
  night: nightCommand,
  season: seasonCommand,
  account: accountCommand,
  backup: backupCommand,
  restore: restoreCommand,
  import: importCommand,
  export: exportCommand,
  flags: flagsCommand,
  'plan-season': planSeasonCommand,
  'plan-night': planNightCommand,
  fit: fitCommand,
  forecast: forecastCommand,
  'site-precision': sitePrecisionCommand,
  'site-statistics': siteStatisticsCommand,
  replan: replanCommand,
  'time-request': timeRequestCommand,
};
