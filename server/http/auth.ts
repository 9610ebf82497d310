/**
 * Bearer-token sign-in and roles. `identify` looks the token up (no token: anonymous); each store
 * route then asks for the role it needs: viewer reads, observer logs nights, lead edits orbits,
 * campaigns and sites. No token → 401; a token whose role is too low → 403.
 */
import type { Context, MiddlewareHandler } from 'hono';
import { roleAtLeast } from '../../descriptors/roles.ts';
import { tokenActor, type Actor, type Role, type Store, type UserRow } from '../store/index.ts';
import { HttpError } from './errors.ts';

export type AuthEnv = { Variables: { user: UserRow | null; tokenId: number | null } };

/** Read the bearer token (or `?token=` for calendar subscriptions, which cannot send headers). */
export function identify(
  store: Store,
  options: { queryTokenPaths?: RegExp } = {},
): MiddlewareHandler<AuthEnv> {
  return async (c, next) => {
    const header = c.req.header('authorization');
    let secret: string | undefined;
    if (header !== undefined) {
      const m = /^Bearer\s+(\S+)\s*$/i.exec(header);
      if (!m)
        throw new HttpError(
          401,
          'unauthenticated',
          'the Authorization header must be "Bearer <token>"',
        );
      secret = m[1];
    } else if (options.queryTokenPaths?.test(c.req.path)) {
      secret = c.req.query('token');
    }
    let signed: { user: UserRow; tokenId: number } | null = null;
    if (secret !== undefined) {
      signed = await store.users.authenticate(secret);
      if (!signed) {
        // A feed token reads as a viewer with no user row and no token of a person.
        const viewer = await feedViewer(store, secret, c.req.path);
        if (viewer) signed = { user: viewer, tokenId: 0 };
      }
      if (!signed)
        throw new HttpError(401, 'unauthenticated', 'the token is unknown or has been revoked');
    }
    c.set('user', signed?.user ?? null);
    c.set('tokenId', signed?.tokenId || null); // a feed token (0) is no token of a person
    await next();
  };
}

/**
 * A feed token (README "Calendar feed") reads its one campaign's calendar as a viewer, whatever
 * the role of the lead who issued it; on any other path it is refused (403) naming what it opens.
 */
async function feedViewer(store: Store, secret: string, path: string): Promise<UserRow | null> {
  const campaignId = await store.users.feedCampaignOf(secret);
  if (campaignId === null) return null;
  const m = /\/campaigns\/(\d+)\/calendar\.ics$/.exec(path);
  if (!m || Number(m[1]) !== campaignId)
    throw new HttpError(
      403,
      'forbidden',
      `this is a feed token: it opens only /api/campaigns/${campaignId}/calendar.ics`,
      { feedCampaignId: campaignId },
    );
  return { id: 0, name: `feed of campaign ${campaignId}`, role: 'viewer', createdAt: '' };
}

/** The signed-in user if their role is at least `role`; otherwise 401 or 403. */
export function requireRole(c: Context<AuthEnv>, role: Role): UserRow {
  const user = c.get('user');
  if (!user)
    throw new HttpError(401, 'unauthenticated', 'sign in: send "Authorization: Bearer <token>"');
  if (!roleAtLeast(user.role, role)) {
    throw new HttpError(
      403,
      'forbidden',
      `this needs the ${role} role; user ${JSON.stringify(user.name)} is ${user.role}`,
      { needed: role, role: user.role },
    );
  }
  return user;
}

/** The signed-in user at `role` or above as the store's writer: the audit trail names them and their token. */
export function writer(c: Context<AuthEnv>, role: Role): Actor {
  const user = requireRole(c, role);
  return tokenActor(user, c.get('tokenId')!);
}

/**
 * Sign-in required at `role` or above on a route outside the store's resources (the stateless
 * computations: ephemeris, events, sky, fits), so that no anonymous caller can spend the server.
 */
export function signedIn(store: Store, role: Role): MiddlewareHandler<AuthEnv> {
  const who = identify(store);
  return (c, next) =>
    who(c, async () => {
      requireRole(c, role);
      await next();
    });
}
