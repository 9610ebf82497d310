/** /users and /audit: accounts with their roles, tokens, and the trail of changes (lead only). */
import { createRoute, z } from '@hono/zod-openapi';
import { AUDIT_VIA, UserInput, type Store } from '../../store/index.ts';
import { requireRole, writer } from '../auth.ts';
import {
  IdParam,
  PageQuery,
  errorResponses,
  json,
  optionalId,
  pageOf,
  resourceApp,
  security,
} from './common.ts';

const User = UserInput.extend({ id: z.number().int(), createdAt: z.string() });
const Issued = z.object({
  user: User,
  tokenId: z.number().int(),
  token: z.string().openapi({ description: 'the bearer secret, shown this once only' }),
});
const Audit = z
  .object({
    id: z.number().int(),
    at: z.string(),
    userId: z
      .number()
      .int()
      .nullable()
      .openapi({ description: 'the signed-in user; null for a local command line' }),
    actorName: z.string().nullable().openapi({
      description:
        'the writer’s name when it wrote: the user’s, or the operating-system account running the command line',
    }),
    via: z
      .enum(AUDIT_VIA)
      .nullable()
      .openapi({ description: 'how the change came: http, cli, or store (demo, start-up)' }),
    tokenId: z
      .number()
      .int()
      .nullable()
      .openapi({ description: 'the bearer token the write came with' }),
    action: z.string(),
    entity: z.string(),
    entityId: z.number().int().nullable(),
    detail: z.unknown().openapi({
      description:
        'create: the values written; update: { changed: { field: { old, new } } }; delete: the ' +
        'row as it was; import: rows and file digest',
    }),
  })
  .strict()
  .openapi('AuditEntry');

const Listing = z
  .object({
    id: z.number().int(),
    userName: z.string(),
    role: UserInput.shape.role,
    label: z.string(),
    createdAt: z.string(),
    revokedAt: z.string().nullable(),
    feedCampaignId: z.number().int().nullable().openapi({
      description: 'a feed token’s campaign (it opens only that feed); null otherwise',
    }),
  })
  .strict()
  .openapi('TokenListing');
const AuditQuery = PageQuery.extend({ entity: z.string().optional(), entityId: optionalId });

export function userRoutes(store: Store) {
  const app = resourceApp();
  addMe(app);
  addUserList(app, store);
  addUserCreate(app, store);
  addTokenList(app, store);
  addTokenIssue(app, store);
  addTokenRevoke(app, store);
  addAuditList(app, store);
  return app;
}

type ResourceApp = ReturnType<typeof resourceApp>;

/** Who the token belongs to. */
function addMe(app: ResourceApp): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/me',
      tags: ['users'],
      security,
      summary: 'Who the token belongs to',
      responses: { 200: json(User, 'the signed-in user'), ...errorResponses },
    }),
    async (c) => c.json(requireRole(c, 'viewer'), 200),
  );
}

/** The users, one page at a time (lead). */
function addUserList(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/users',
      tags: ['users'],
      security,
      summary: 'List users',
      request: { query: PageQuery },
      responses: { 200: json(pageOf(User), 'one page'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'lead');
      return c.json(await store.users.list(c.req.valid('query')), 200);
    },
  );
}

/** A new user with its first token, shown once (lead). */
function addUserCreate(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'post',
      path: '/users',
      tags: ['users'],
      security,
      summary: 'Create a user and its first token (shown once)',
      request: {
        body: { content: { 'application/json': { schema: UserInput.strict() } }, required: true },
      },
      responses: { 201: json(Issued, 'created'), ...errorResponses },
    }),
    async (c) => {
      const lead = writer(c, 'lead');
      const { user, tokenId, secret } = await store.users.createWithToken(
        lead,
        c.req.valid('json'),
      );
      return c.json({ user, tokenId, token: secret }, 201);
    },
  );
}

/** Every token (or one user's), never the hash (lead). */
function addTokenList(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/tokens',
      tags: ['users'],
      security,
      summary:
        'List tokens (every user’s, or one’s): holder, label, issued, revoked; never a secret',
      request: {
        query: z.object({
          userName: z.string().optional().openapi({ description: 'only this user’s tokens' }),
        }),
      },
      responses: {
        200: json(z.object({ tokens: z.array(Listing) }).strict(), 'oldest first'),
        ...errorResponses,
      },
    }),
    async (c) => {
      requireRole(c, 'lead');
      return c.json({ tokens: await store.users.listTokens(c.req.valid('query').userName) }, 200);
    },
  );
}

/** A further token for a user, shown once (lead). */
function addTokenIssue(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'post',
      path: '/tokens',
      tags: ['users'],
      security,
      summary: 'Issue a further token for an existing user (shown once)',
      request: {
        body: {
          content: {
            'application/json': {
              schema: z
                .object({
                  userName: z.string().min(1).openapi({ description: 'the user’s name' }),
                  label: z.string().max(200).optional().openapi({ description: 'what it is for' }),
                })
                .strict(),
            },
          },
          required: true,
        },
      },
      responses: { 201: json(Issued, 'issued'), ...errorResponses },
    }),
    async (c) => {
      const lead = writer(c, 'lead');
      const { userName, label } = c.req.valid('json');
      const { user, tokenId, secret } = await store.users.issueToken(
        lead,
        userName,
        label ?? 'issued through the server',
      );
      return c.json({ user, tokenId, token: secret }, 201);
    },
  );
}

/** Revoke a token (lead). */
function addTokenRevoke(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'delete',
      path: '/tokens/{id}',
      tags: ['users'],
      security,
      summary: 'Revoke a token',
      request: { params: IdParam },
      responses: { 204: { description: 'revoked' }, ...errorResponses },
    }),
    async (c) => {
      const lead = writer(c, 'lead');
      await store.users.revokeToken(lead, c.req.valid('param').id);
      return c.body(null, 204);
    },
  );
}

/** The audit trail, newest first (lead). */
function addAuditList(app: ResourceApp, store: Store): void {
  app.openapi(
    createRoute({
      method: 'get',
      path: '/audit',
      tags: ['users'],
      security,
      summary: 'Who changed what and when, newest first',
      request: { query: AuditQuery },
      responses: { 200: json(pageOf(Audit), 'one page'), ...errorResponses },
    }),
    async (c) => {
      requireRole(c, 'lead');
      const { entity, entityId, ...page } = c.req.valid('query');
      return c.json(await store.audit.list({ entity, entityId }, page), 200);
    },
  );
}
