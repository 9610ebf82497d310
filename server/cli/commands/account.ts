/** `epochwright account`: create users with a role, issue, list and revoke tokens (secrets shown once). */
import { parseArgs } from 'node:util';
import { InputError } from '../../science/errors.ts';
import { NotFoundError, type Store, type TokenListing, type UserRow } from '../../store/index.ts';
import { UsageError, type Command } from '../io.ts';
import { outputFormat, positiveId } from '../args.ts';
import { render } from '../output.ts';
import { STORE_HELP, storeAction, storeOptions, type Api } from './store-option.ts';

const help = `usage: epochwright account add --name <name> --role lead|observer|viewer
       epochwright account token --name <name> [--label <text>]
       epochwright account feed-token --name <lead> --campaign-id <id> [--label <text>]
       epochwright account list [--json|--csv]
       epochwright account tokens [--name <name>] [--json|--csv]
       epochwright account revoke --token-id <id>

add     creates a user and prints its first bearer token (shown this once; only a hash is kept)
token   issues a further token for an existing user
feed-token
        issues a read-only token that opens one campaign's calendar feed and nothing else, held
        by the named user; subscribe to /api/campaigns/<id>/calendar.ics?token=<it>
list    shows the users and their roles
tokens  shows every token (or one user's): id, holder, label, when issued and when revoked;
        secrets cannot be shown again, only the id names a token
revoke  stops a token from signing in at once; the record stays, marked with the time

roles: lead edits orbits, campaigns and sites; observer writes nights, blocks, reports and
measurements; viewer reads.

options:
${STORE_HELP}
`;

/** A missing row named on the command line is bad input (exit 2), not a failure. */
const asInputError =
  (field: string, value: unknown, rule: string) =>
  (err: unknown): never => {
    throw err instanceof NotFoundError ? new InputError(field, value, rule) : err;
  };

export const accountCommand: Command = {
  summary: 'create users with a role; issue, list and revoke their bearer tokens',
  help,
  async run(argv) {
    const { values, positionals } = parseArgs({
      args: argv,
      options: {
        ...storeOptions,
        name: { type: 'string' },
        role: { type: 'string' },
        label: { type: 'string' },
        'token-id': { type: 'string' },
        'campaign-id': { type: 'string' },
        json: { type: 'boolean' },
        csv: { type: 'boolean' },
      },
      strict: true,
      allowPositionals: true,
    });
    const [action, ...extra] = positionals;
    if (extra.length) throw new UsageError(`unexpected ${JSON.stringify(extra[0])}`);
    const writes = ['add', 'token', 'feed-token', 'revoke'].includes(action ?? '');
    const users = {
      local: (store: Store) => store.users.list({ limit: 500 }).then((p) => p.items),
      remote: async (api: Api) =>
        (await api<{ items: UserRow[] }>({ method: 'GET', path: '/users', query: { limit: 500 } }))
          .items,
    };
    switch (action) {
      case 'add': {
        if (values.name === undefined || values.role === undefined)
          throw new UsageError('account add needs --name and --role');
        const user = { name: values.name, role: values.role };
        const issued = await storeAction(values, {
          local: (store, actor) =>
            store.users.createWithToken(actor, user, values.label ?? 'created at the command line'),
          remote: async (api) => {
            const r = await api<{ user: UserRow; tokenId: number; token: string }>({
              method: 'POST',
              path: '/users',
              body: user,
            });
            return { user: r.user, tokenId: r.tokenId, secret: r.token };
          },
          writes,
        });
        return (
          `created ${issued.user.role} ${JSON.stringify(issued.user.name)} (id ${issued.user.id}).\ntoken ` +
          `(shown once): ${issued.secret}\n`
        );
      }
      case 'token': {
        if (values.name === undefined) throw new UsageError('account token needs --name');
        const name = values.name;
        const issued = await storeAction(values, {
          local: (store, actor) =>
            store.users.issueToken(actor, name, values.label ?? 'issued at the command line'),
          remote: async (api) => {
            const r = await api<{ user: UserRow; tokenId: number; token: string }>({
              method: 'POST',
              path: '/tokens',
              body: { userName: name, label: values.label ?? 'issued at the command line' },
            });
            return { user: r.user, tokenId: r.tokenId, secret: r.token };
          },
          writes,
        });
        return (
          `new token for ${JSON.stringify(issued.user.name)} (token id ${issued.tokenId}), shown once: ` +
          `${issued.secret}\n`
        );
      }
      case 'feed-token': {
        const remote = values.server !== undefined;
        if ((values.name === undefined && !remote) || values['campaign-id'] === undefined)
          throw new UsageError(
            'account feed-token needs --name and --campaign-id (with --server: the token’s user holds it)',
          );
        const campaignId = positiveId('campaign-id', values['campaign-id']);
        const label = values.label ?? 'calendar feed';
        const issued = await storeAction(values, {
          local: (store, actor) =>
            store.users.issueFeedToken(actor, values.name!, campaignId, label),
          remote: async (api) => {
            const r = await api<{ tokenId: number; token: string }>({
              method: 'POST',
              path: `/campaigns/${campaignId}/feed-tokens`,
              body: { label },
            });
            return { tokenId: r.tokenId, secret: r.token };
          },
          writes,
        });
        return (
          `feed token for campaign ${campaignId} (token id ${issued.tokenId}), shown once: ` +
          `${issued.secret}\nsubscribe to ` +
          `/api/campaigns/${campaignId}/calendar.ics?token=${issued.secret}\n`
        );
      }
      case 'list': {
        const rows = await storeAction(values, users);
        return render(
          outputFormat(values),
          rows,
          [
            { header: 'id', value: (u) => u.id },
            { header: 'name', value: (u) => u.name },
            { header: 'role', value: (u) => u.role },
            { header: 'created (UTC)', value: (u) => u.createdAt },
          ],
          rows,
        );
      }
      case 'tokens': {
        const rows = await storeAction(values, {
          local: (store) => store.users.listTokens(values.name),
          remote: async (api) =>
            (
              await api<{ tokens: TokenListing[] }>({
                method: 'GET',
                path: '/tokens',
                query: { userName: values.name },
              })
            ).tokens,
        }).catch(asInputError('--name', values.name, 'does not name a user (see `account list`)'));
        return render(
          outputFormat(values),
          rows,
          [
            { header: 'id', value: (t) => t.id },
            { header: 'user', value: (t) => t.userName },
            { header: 'role', value: (t) => t.role },
            { header: 'label', value: (t) => t.label },
            { header: 'issued (UTC)', value: (t) => t.createdAt },
            { header: 'revoked (UTC)', value: (t) => t.revokedAt ?? '' },
          ],
          rows,
        );
      }
      case 'revoke': {
        if (values['token-id'] === undefined)
          throw new UsageError('account revoke needs --token-id <id> (see `account tokens`)');
        const id = Number(values['token-id']);
        // An InputError like the unknown-token path below, so both name --token-id the same way.
        if (!Number.isInteger(id) || id <= 0)
          throw new InputError(
            '--token-id',
            values['token-id'],
            'must be a positive whole number, a token id from `account tokens`',
          );
        const unknown = asInputError(
          '--token-id',
          values['token-id'],
          'does not name an active token (see `account tokens`)',
        );
        return storeAction(values, {
          local: async (store, actor) => {
            const t = await store.users.revokeToken(actor, id).catch(unknown);
            return (
              `revoked token ${t.id} (${JSON.stringify(t.label)}) of ${JSON.stringify(t.userName)} at ` +
              `${t.revokedAt ?? ''}; it no longer signs in.\n`
            );
          },
          remote: async (api) => {
            await api({ method: 'DELETE', path: `/tokens/${id}` }).catch(unknown);
            return `revoked token ${id}; it no longer signs in.\n`;
          },
          writes,
        });
      }
      default:
        throw new UsageError(
          `account: say add, token, feed-token, list, tokens or revoke${action ? ` (not ${JSON.stringify(action)})` : ''}`,
        );
    }
  },
};
