/**
 * What the store throws besides InputError (bad values, 422): a missing row (404), a write that
 * clashes with the stored state (409: stale version, duplicate name, row still in use, blocks
 * overlapping, an edit that would break the rows depending on it).
 */
export class NotFoundError extends Error {
  override readonly name = 'NotFoundError';
  constructor(
    readonly entity: string,
    readonly id: number | string,
  ) {
    super(`no ${entity} with id ${JSON.stringify(id)}`);
  }
}

export class ConflictError extends Error {
  override readonly name = 'ConflictError';
  constructor(
    readonly code:
      | 'stale_version'
      | 'duplicate'
      | 'in_use'
      | 'not_allowed'
      /** A block over another block of its site, with no reason given. */
      | 'overlap'
      /** An edit that would break stored rows depending on the edited one (named in details.dependents). */
      | 'dependent_rows',
    message: string,
    readonly details?: Record<string, unknown>,
  ) {
    super(message);
  }
}

/** The SQLite error code under drizzle's DrizzleQueryError wrapper (or on the error itself). */
export function sqliteCode(err: unknown): string | undefined {
  for (
    let e: unknown = err, depth = 0;
    e && depth < 4;
    e = (e as { cause?: unknown }).cause, depth++
  ) {
    const code = (e as { code?: unknown }).code;
    if (typeof code === 'string' && code.startsWith('SQLITE_')) return code;
  }
  return undefined;
}

function causeMessage(err: unknown): string {
  let e: unknown = err;
  while ((e as { cause?: unknown }).cause) e = (e as { cause?: unknown }).cause;
  return e instanceof Error ? e.message : String(e);
}

/** "nights.site_id, nights.date" → "site and date": the columns of a constraint in words. */
function columnWords(cols: string): string {
  const words = cols
    .split(',')
    .map((c) =>
      c
        .trim()
        .replace(/^\w+\./, '')
        .replace(/_id$/, '')
        .replaceAll('_', ' '),
    )
    .filter(Boolean);
  return words.length ? words.join(' and ') : 'key';
}

/** Turn a constraint failure into a ConflictError that says what clashed; rethrow anything else. */
export function translateConstraint(err: unknown, entity: string): never {
  const code = sqliteCode(err);
  if (code?.startsWith('SQLITE_CONSTRAINT')) {
    const msg = causeMessage(err);
    if (/UNIQUE/i.test(msg)) {
      const cols = /UNIQUE constraint failed: (.*)$/i.exec(msg)?.[1] ?? '';
      throw new ConflictError(
        'duplicate',
        `a ${entity} with the same ${columnWords(cols)} already exists`,
        { columns: cols },
      );
    }
    if (/FOREIGN KEY/i.test(msg)) {
      throw new ConflictError(
        'in_use',
        `the ${entity} is still referenced by other records (remove those first)`,
      );
    }
  }
  throw err;
}
