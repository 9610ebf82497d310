/**
 * A file imported twice: recognised by the SHA-256 digest of its text, which each import records in
 * its audit entry. A second import of the same file is refused unless the user allows duplicates.
 */
import { createHash } from 'node:crypto';
import { and, desc, eq, sql } from 'drizzle-orm';
import { auditTrail } from '../../../db/schema.ts';
import type { DbOrTx } from '../database.ts';
import type { ImportProblem } from './read.ts';

/** The digest an import records: SHA-256 of the file's text, hex. */
export function fileDigest(text: string): string {
  return createHash('sha256').update(text, 'utf8').digest('hex');
}

/** The problem to report when a file with this digest was imported before as `kind`; else null. */
export async function repeatedFileProblem(
  tx: DbOrTx,
  kind: string,
  digest: string,
): Promise<ImportProblem | null> {
  const [earlier] = await tx
    .select({ id: auditTrail.id, at: auditTrail.at })
    .from(auditTrail)
    .where(
      and(
        eq(auditTrail.action, 'import'),
        eq(auditTrail.entity, kind),
        eq(sql`json_extract(${auditTrail.detail}, '$.digest')`, digest),
      ),
    )
    .orderBy(desc(auditTrail.id))
    .limit(1);
  if (!earlier) return null;
  return {
    line: 1,
    column: '(file)',
    value: digest,
    rule: `was imported already at ${earlier.at} (audit entry ${earlier.id}); set allowDuplicates to import it again`,
  };
}
