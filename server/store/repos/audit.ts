/** Reading the audit trail (written by audit.ts inside each change's transaction). */
import { and, desc, eq } from 'drizzle-orm';
import { auditTrail } from '../../../db/schema.ts';
import { DEFAULT_LIMIT, MAX_LIMIT, type Page, type PageRequest } from '../crud.ts';
import type { Db } from '../database.ts';

export type AuditRow = typeof auditTrail.$inferSelect;

/** Which audit entries to list: of one entity kind (its singular name) and one row of it. */
export interface AuditFilter {
  entity?: string | undefined;
  entityId?: number | undefined;
}

/** Reading the trail: newest first, one page at a time. */
export function auditLog(db: Db) {
  return {
    list: async (filter: AuditFilter = {}, page: PageRequest = {}): Promise<Page<AuditRow>> => {
      const limit = Math.min(page.limit ?? DEFAULT_LIMIT, MAX_LIMIT);
      const offset = page.offset ?? 0;
      const cond = and(
        filter.entity ? eq(auditTrail.entity, filter.entity) : undefined,
        filter.entityId ? eq(auditTrail.entityId, filter.entityId) : undefined,
      );
      const items = await db
        .select()
        .from(auditTrail)
        .where(cond)
        .orderBy(desc(auditTrail.id))
        .limit(limit)
        .offset(offset);
      return { items, total: await db.$count(auditTrail, cond), limit, offset };
    },
  };
}
