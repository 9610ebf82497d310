/** The store's public surface is pinned: a change to it is a deliberate change to these lists. */
import { expect, it } from 'vitest';
import * as store from '../../server/store/index.ts';

it('exports exactly the store entry points', () => {
  expect(Object.keys(store).sort()).toEqual([
    'ACCEPT_AT_TOLERANCE_MINUTES',
    'AUDIT_VIA',
    'BLOCK_ORIGINS',
    'BLOCK_STATUSES',
    'BlockFields',
    'CLEAR_PRIOR_COLUMNS',
    'COLUMNS',
    'CSV_KINDS',
    'CampaignFields',
    'ConflictError',
    'DEFAULT_PRIOR_STRENGTH_NIGHTS',
    'DEFAULT_WEATHER',
    'ImportRejected',
    'LOCAL_OPERATOR',
    'MEASUREMENT_COLUMNS',
    'MOST_NIGHTS_PER_REQUEST',
    'MeasurementFields',
    'NIGHT_CHOICES',
    'NUMERIC',
    'NightFields',
    'NightReportFields',
    'NotFoundError',
    'OrbitSolutionInput',
    'REQUIRED_COLUMNS',
    'RESIDUAL_CSV_COLUMNS',
    'SITE_TOTAL',
    'SiteFields',
    'SystemFields',
    'TargetFields',
    'UserInput',
    'WEATHER_CHOICES',
    'commandLineActor',
    'createStore',
    'displayUrl',
    'ephemerisCsv',
    'escapeFormulaCell',
    'filePath',
    'locateDatabase',
    'measurementsCsv',
    'openDatabase',
    'orbitsCsv',
    'readClearPriorCsv',
    'residualsCsv',
    'resolveDatabaseUrl',
    'skyOfRows',
    'startStore',
    'timeRequestCsv',
    'tokenActor',
  ]); // server/store/index.ts as designed
});

it('a store hands out repositories and views, never the database handle', async () => {
  const s = store.createStore(await store.openDatabase({ url: ':memory:' }));
  try {
    expect(Object.keys(s).sort()).toEqual([
      'allocations',
      'archive',
      'audit',
      'backup',
      'blocks',
      'campaigns',
      'close',
      'exports',
      'fits',
      'importCsv',
      'importPreparedMeasurements',
      'loadDemo',
      'measurements',
      'nightReports',
      'nightVisibility',
      'nights',
      'orbitSolutions',
      'plans',
      'restoreArchive',
      'siteWeather',
      'sites',
      'storedSky',
      'systems',
      'targets',
      'url',
      'users',
    ]); // server/store/store.ts as designed: no `db`, no `database`
  } finally {
    s.close();
  }
});
