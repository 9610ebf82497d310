/**
 * Users, their roles and bearer tokens. A token is 32 random bytes shown once; only its SHA-256
 * is stored, so a copy of the database does not hand out access.
 */
import { createHash, randomBytes } from 'node:crypto';
import { and, asc, count, eq, isNull } from 'drizzle-orm';
import { tokens, users } from '../../../db/schema.ts';
import { recordAudit, type Actor } from '../audit.ts';
import { nowIso } from '../../clock.ts';
import { entity, getById, insertIn, list } from '../crud.ts';
import type { Db, Tx } from '../database.ts';
import { ConflictError, NotFoundError } from '../errors.ts';
import { lineText, parseInput } from '../schemas/common.ts';
import { UserInput, type Role } from '../schemas/entities.ts';
import { campaignEntity } from './campaigns.ts';

export type UserRow = typeof users.$inferSelect;
export type { Role };

export const userEntity = entity<UserRow>({
  name: 'user',
  table: users,
  hasUpdatedAt: false,
  versioned: false,
  orderBy: [users.name],
});

const TokenLabel = lineText(200);

/** Token prefix makes a leaked secret easy to recognise in logs and scanners. */
const TOKEN_PREFIX = 'ewt_';

export function hashToken(secret: string): string {
  return createHash('sha256').update(secret, 'utf8').digest('hex');
}

export interface IssuedToken {
  user: UserRow;
  tokenId: number;
  /** The bearer secret: shown once, never stored. */
  secret: string;
}

/** A token as it may be shown: who holds it and when it was issued or revoked. */
export interface TokenListing {
  id: number;
  userName: string;
  role: Role;
  label: string;
  createdAt: string;
  revokedAt: string | null;
  /** A feed token's campaign (it opens that campaign's calendar feed and nothing else); null otherwise. */
  feedCampaignId: number | null;
}
const listing = {
  id: tokens.id,
  feedCampaignId: tokens.feedCampaignId,
  userName: users.name,
  role: users.role,
  label: tokens.label,
  createdAt: tokens.createdAt,
  revokedAt: tokens.revokedAt,
};

/**
 * The team keeps a way in: revoking the last active token any lead holds is refused (inside the
 * revoking transaction, so the revocation rolls back), since only a lead can issue tokens over HTTP.
 */
async function keepOneLeadToken(tx: Tx, revokedId: number): Promise<void> {
  const [owner] = await tx
    .select({ role: users.role })
    .from(tokens)
    .innerJoin(users, eq(users.id, tokens.userId))
    .where(eq(tokens.id, revokedId));
  if (owner?.role !== 'lead') return;
  const [left] = await tx
    .select({ n: count() })
    .from(tokens)
    .innerJoin(users, eq(users.id, tokens.userId))
    // A feed token opens one calendar and no door to manage the team: it does not count.
    .where(and(eq(users.role, 'lead'), isNull(tokens.revokedAt), isNull(tokens.feedCampaignId)));
  if ((left?.n ?? 0) === 0)
    throw new ConflictError(
      'not_allowed',
      `token ${revokedId} is the last active token of any lead; issue a lead another token first, ` +
        `or nobody could manage the team`,
      { tokenId: revokedId },
    );
}

export function userRepository(db: Db) {
  return {
    entity: userEntity,
    list: (page?: { limit?: number; offset?: number }) => list(db, userEntity, [], page),
    get: (id: number) => getById(db, userEntity, id),
    count: async () => (await list(db, userEntity, [], { limit: 1 })).total,
    /** Create a user and its first token in one transaction. */
    createWithToken: (actor: Actor, input: unknown, label = 'first token') =>
      db.transaction(async (tx) => {
        const u = parseInput(UserInput, input);
        const user = await insertIn(tx, userEntity, actor, u);
        return issue(tx, actor, user, label);
      }),
    /** A further token for an existing user, by name. */
    issueToken: (actor: Actor, userName: string, label: string) =>
      db.transaction(async (tx) => {
        const [user] = await tx.select().from(users).where(eq(users.name, userName));
        if (!user) throw new NotFoundError('user named', userName);
        return issue(tx, actor, user, label);
      }),
    /**
     * A read-only token for one campaign's calendar feed, held by `userName` (who issued it): it
     * opens `/campaigns/{id}/calendar.ics` and nothing else, and is revoked like any token.
     */
    issueFeedToken: (actor: Actor, userName: string, campaignId: number, label: string) =>
      db.transaction(async (tx) => {
        const [user] = await tx.select().from(users).where(eq(users.name, userName));
        if (!user) throw new NotFoundError('user named', userName);
        await getById(tx, campaignEntity, campaignId);
        return issue(tx, actor, user, label, campaignId);
      }),
    /** Revoke an active token; returns what was revoked (never the hash). */
    revokeToken: (actor: Actor, tokenId: number) => revokeToken(db, actor, tokenId),
    /** Every token (or one user's, by name), oldest first: id, owner, label and dates; never the hash. */
    listTokens: async (userName?: string): Promise<TokenListing[]> => {
      if (
        userName !== undefined &&
        (await db.select({ id: users.id }).from(users).where(eq(users.name, userName))).length === 0
      ) {
        throw new NotFoundError('user named', userName);
      }
      return db
        .select(listing)
        .from(tokens)
        .innerJoin(users, eq(users.id, tokens.userId))
        .where(userName === undefined ? undefined : eq(users.name, userName))
        .orderBy(asc(tokens.id));
    },
    /** The user a bearer secret belongs to, or null (unknown, revoked or a feed token). */
    authenticate: (secret: string) => authenticate(db, secret),
    /** The campaign an active feed token opens, or null when the secret is no active feed token. */
    feedCampaignOf: async (secret: string): Promise<number | null> => {
      const [row] = await db
        .select({ campaignId: tokens.feedCampaignId })
        .from(tokens)
        .where(and(eq(tokens.hash, hashToken(secret)), isNull(tokens.revokedAt)))
        .limit(1);
      return row?.campaignId ?? null;
    },
  };
}

async function issue(
  tx: Tx,
  actor: Actor,
  user: UserRow,
  rawLabel: string,
  feedCampaignId: number | null = null,
): Promise<IssuedToken> {
  const label = parseInput(TokenLabel, rawLabel, 'label');
  const secret = TOKEN_PREFIX + randomBytes(32).toString('base64url');
  const [row] = await tx
    .insert(tokens)
    .values({
      userId: user.id,
      hash: hashToken(secret),
      label,
      createdAt: nowIso(),
      feedCampaignId,
    })
    .returning();
  await recordAudit(tx, actor, 'create', 'token', row!.id, {
    userId: user.id,
    label,
    ...(feedCampaignId === null ? {} : { feedCampaignId }),
  });
  return { user, tokenId: row!.id, secret };
}

/** Revoke an active token; returns what was revoked (never the hash). */
function revokeToken(db: Db, actor: Actor, tokenId: number): Promise<TokenListing> {
  return db.transaction(async (tx) => {
    const done = await tx
      .update(tokens)
      .set({ revokedAt: nowIso() })
      .where(and(eq(tokens.id, tokenId), isNull(tokens.revokedAt)))
      .returning({ id: tokens.id });
    if (done.length === 0) throw new NotFoundError('active token', tokenId);
    await keepOneLeadToken(tx, tokenId);
    await recordAudit(tx, actor, 'update', 'token', tokenId, { revoked: true });
    const [row] = await tx
      .select(listing)
      .from(tokens)
      .innerJoin(users, eq(users.id, tokens.userId))
      .where(eq(tokens.id, tokenId));
    return row!;
  });
}

/** The user a bearer secret belongs to and the token's id; null when unknown, revoked or a feed token. */
async function authenticate(
  db: Db,
  secret: string,
): Promise<{ user: UserRow; tokenId: number } | null> {
  const rows = await db
    .select({ user: users, tokenId: tokens.id })
    .from(tokens)
    .innerJoin(users, eq(users.id, tokens.userId))
    .where(
      and(
        eq(tokens.hash, hashToken(secret)),
        isNull(tokens.revokedAt),
        isNull(tokens.feedCampaignId),
      ),
    )
    .limit(1);
  return rows[0] ?? null;
}
