/**
 * The one error → HTTP table (server/http/errors.ts) is pinned: every error class the server
 * defines is in it, in an order where no class is shadowed by its parent, and maps as listed.
 */
import { JobRefused } from '../../server/jobs/pool.ts';
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { HTTPException } from 'hono/http-exception';
import { describe, expect, it } from 'vitest';
import { ERROR_TABLE, HttpError, toHttpError } from '../../server/http/errors.ts';
import { RequestInvalid } from '../../server/http/request-invalid.ts';
import { ComputationError, InputError } from '../../server/science/errors.ts';
import { FitRefusal } from '../../server/science/orbit/fit/index.ts';
import { ConflictError, ImportRejected, NotFoundError } from '../../server/store/index.ts';

const REPO = resolve(import.meta.dirname, '../..');
/** Error classes that never reach HTTP as a status of their own: the CLI's usage error, the importer's private rollback signals, a nested transaction (a programming error: a 500), and a database start-up cannot migrate (the server does not start). */
const NOT_HTTP = [
  'server/cli/io.ts UsageError',
  'server/store/csv/import.ts Rollback',
  'server/store/csv/import-measurements.ts SwapRefused',
  'server/store/write-gate.ts NestedTransaction',
  'server/store/migration-gaps.ts MigrationGap',
];

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? sources(p) : /\.ts$/.test(f) ? [p] : [];
  });
}

/** Every `class X extends …Error` (or HTTPException) under server/, as "file Name". */
function declaredErrorClasses(): string[] {
  return sources(join(REPO, 'server')).flatMap((f) =>
    [...readFileSync(f, 'utf8').matchAll(/class (\w+) extends (\w*Error|HTTPException)\b/g)].map(
      (m) => `${relative(REPO, f)} ${m[1]}`,
    ),
  );
}

describe('the error table', () => {
  it('lists every error class of the server, and only those that reach HTTP', () => {
    const listed = ERROR_TABLE.map((r) => r.type.name);
    expect(listed).toEqual([
      'HttpError',
      'NotFoundError',
      'ConflictError',
      'ImportRejected',
      'RequestInvalid',
      'InputError',
      'FitRefusal',
      'ComputationError',
      'JobRefused',
      'HTTPException',
    ]); // server/http/errors.ts as designed
    const declared = declaredErrorClasses().filter((d) => !NOT_HTTP.includes(d));
    expect(declared.map((d) => d.split(' ')[1]).sort()).toEqual(
      listed.filter((n) => n !== 'HTTPException').sort(),
    );
  });

  it('puts every subclass before its parent, so no rule is shadowed', () => {
    ERROR_TABLE.forEach((later, j) => {
      for (const earlier of ERROR_TABLE.slice(0, j))
        expect(later.type.prototype instanceof earlier.type, `${later.type.name}`).toBe(false);
    });
  });

  const report: ImportRejected['report'] = {
    kind: 'targets',
    dryRun: false,
    rows: 1,
    written: 0,
    problems: [{ line: 2, column: 'name', value: '', rule: 'is required' }],
  };
  const cases: [string, Error, number, string, unknown][] = [
    ['HttpError', new HttpError(403, 'forbidden', 'no'), 403, 'forbidden', undefined],
    ['NotFoundError', new NotFoundError('night', 7), 404, 'not_found', { entity: 'night', id: 7 }],
    [
      'ConflictError',
      new ConflictError('stale_version', 'changed', { currentVersion: 3 }),
      409,
      'stale_version',
      { currentVersion: 3 },
    ],
    ['ImportRejected', new ImportRejected(report), 422, 'import_rejected', report],
    [
      'RequestInvalid, a wrong shape among the issues',
      new RequestInvalid([
        { field: 'raDeg', rule: 'Too big', code: 'too_big', value: 400 },
        { field: 'name', rule: 'expected string', code: 'invalid_type' },
      ]),
      400,
      'invalid_request',
      {
        issues: [
          { field: 'raDeg', rule: 'Too big', code: 'too_big', value: 400 },
          { field: 'name', rule: 'expected string', code: 'invalid_type' },
        ],
      },
    ], // a malformed request: README "HTTP API" (400 malformed)
    [
      'RequestInvalid, every issue a broken rule',
      new RequestInvalid([
        { field: 'raDeg', rule: 'Too big', code: 'too_big', value: 400 },
        { field: 'date', rule: 'Invalid ISO date', code: 'invalid_format', value: '2027-02-30' },
      ]),
      422,
      'invalid_value',
      {
        field: 'raDeg',
        value: 400,
        rule: 'Too big',
        issues: [
          { field: 'raDeg', rule: 'Too big', code: 'too_big', value: 400 },
          { field: 'date', rule: 'Invalid ISO date', code: 'invalid_format', value: '2027-02-30' },
        ],
      },
    ], // a value that breaks a rule: README "HTTP API" (422)
    [
      'InputError',
      new InputError('eccentricity', 1.2, 'must be below 1'),
      422,
      'invalid_value',
      { field: 'eccentricity', value: 1.2, rule: 'must be below 1' },
    ],
    [
      'InputError with problems',
      new InputError('a', 1, 'r1', [
        { field: 'a', value: 1, rule: 'r1' },
        { field: 'b', value: 2, rule: 'r2' },
      ]),
      422,
      'invalid_value',
      {
        field: 'a',
        value: 1,
        rule: 'r1',
        problems: [
          { field: 'a', value: 1, rule: 'r1' },
          { field: 'b', value: 2, rule: 'r2' },
        ],
      },
    ],
    [
      'FitRefusal',
      new FitRefusal('too-few-measurements', 'cannot fit', ['distancePc']),
      422,
      'fit_refused',
      { reason: 'too-few-measurements', parameters: ['distancePc'] },
    ],
    ['ComputationError', new ComputationError('no periapsis'), 422, 'no_solution', undefined],
    [
      'JobRefused',
      new JobRefused('time_limit', 'stopped', { task: 'fitOrbits', timeLimitS: 120 }),
      503,
      'time_limit',
      { task: 'fitOrbits', timeLimitS: 120 },
    ],
    ['HTTPException 413', new HTTPException(413), 413, 'body_too_large', undefined],
    ['anything else', new TypeError('boom'), 500, 'internal', undefined],
  ];
  it.each(cases)('maps %s', (_name, err, status, code, details) => {
    const e = toHttpError(err);
    expect([e.status, e.code, e.details]).toEqual([status, code, details]);
  });
});
