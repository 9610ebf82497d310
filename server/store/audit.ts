/**
 * The audit trail: who changed what and when, written in the same transaction as the change. An
 * entry names its writer three ways: the user (null at the command line, which needs no account),
 * the writer's name as it was (the user's, or the operating-system account running the command
 * line), and how the change came (`http` with the bearer token used, `cli`, or `store` for the
 * store's own writes: the demo, start-up). An update records the fields it changed with their old
 * and new values; a delete, the row as it was.
 */
import { auditTrail, type AUDIT_VIA } from '../../db/schema.ts';
import type { DbOrTx } from './database.ts';
import { nowIso } from '../clock.ts';

export type AuditVia = (typeof AUDIT_VIA)[number];

/** Who is writing, and how. */
export interface Actor {
  /** The signed-in user (HTTP, or a command line acting with a token); null for a local operator. */
  userId: number | null;
  /** The writer's name: the user's, or the operating-system account at the command line. */
  name?: string | null;
  via?: AuditVia;
  /** The bearer token the write came with. */
  tokenId?: number | null;
}

/** The store writing on its own account (demo, start-up, tests). */
export const LOCAL_OPERATOR: Actor = { userId: null, via: 'store' };

/** The command line run by the operating-system account `account`, with no token. */
export function commandLineActor(account: string): Actor {
  return { userId: null, name: account, via: 'cli' };
}

/** A user acting with one of their tokens: over HTTP, or at a command line given that token. */
export function tokenActor(
  user: { id: number; name: string },
  tokenId: number,
  via: AuditVia = 'http',
): Actor {
  return { userId: user.id, name: user.name, via, tokenId };
}

export type AuditAction = 'create' | 'update' | 'delete' | 'import';

/** The fields of `patch` whose value differs from `before`, each with its old and new value. */
export function changedFields(
  before: Record<string, unknown>,
  patch: Record<string, unknown>,
  ignore: readonly string[] = ['updatedAt', 'version'],
): Record<string, { old: unknown; new: unknown }> {
  const out: Record<string, { old: unknown; new: unknown }> = {};
  for (const [k, v] of Object.entries(patch)) {
    if (ignore.includes(k) || v === undefined) continue;
    const old = before[k] ?? null;
    if (JSON.stringify(old) !== JSON.stringify(v ?? null)) out[k] = { old, new: v ?? null };
  }
  return out;
}

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
    actorName: actor.name ?? null,
    via: actor.via ?? null,
    tokenId: actor.tokenId ?? null,
    action,
    entity,
    entityId,
    detail: detail ?? null,
  });
}
