/** The audit trail: who changed what and when, written in the same transaction as the change. */
import { auditTrail } from '../../db/schema.ts';
import type { DbOrTx } from './database.ts';
import { nowIso } from '../clock.ts';

/** Who is writing: a signed-in user, or the local operator at the command line (null). */
export interface Actor {
  userId: number | null;
}
export const LOCAL_OPERATOR: Actor = { userId: null };

export type AuditAction = 'create' | 'update' | 'delete' | 'import';

export async function recordAudit(
  tx: DbOrTx,
  actor: Actor,
  action: AuditAction,
  entity: string,
  entityId: number | null,
  detail?: unknown,
): Promise<void> {
  await tx.insert(auditTrail).values({
    at: nowIso(),
    userId: actor.userId,
    action,
    entity,
    entityId,
    detail: detail ?? null,
  });
}
