/** `epochwright account`: create users with a role, issue, list and revoke tokens (secrets shown once). */
import { parseArgs } from 'node:util';
import { InputError } from '../../science/errors.ts';
import { NotFoundError } from '../../store/index.ts';
import { localActor } from '../actor.ts';
import { UsageError, type Command } from '../io.ts';
import { outputFormat, positiveId } from '../args.ts';
import { render } from '../output.ts';
import { DATABASE_HELP, databaseOption, withStore } from './store-option.ts';

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
${DATABASE_HELP}
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
        ...databaseOption,
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
    return withStore(
      values.database,
      async (store) => {
        switch (action) {
          case 'add': {
            if (values.name === undefined || values.role === undefined)
              throw new UsageError('account add needs --name and --role');
            const issued = await store.users.createWithToken(
              localActor(),
              { name: values.name, role: values.role },
              values.label ?? 'created at the command line',
            );
            return `created ${issued.user.role} ${JSON.stringify(issued.user.name)} (id ${issued.user.id}).\ntoken (shown once): ${issued.secret}\n`;
          }
          case 'token': {
            if (values.name === undefined) throw new UsageError('account token needs --name');
            const issued = await store.users.issueToken(
              localActor(),
              values.name,
              values.label ?? 'issued at the command line',
            );
            return `new token for ${JSON.stringify(issued.user.name)} (token id ${issued.tokenId}), shown once: ${issued.secret}\n`;
          }
          case 'feed-token': {
            if (values.name === undefined || values['campaign-id'] === undefined)
              throw new UsageError('account feed-token needs --name and --campaign-id');
            const campaignId = positiveId('campaign-id', values['campaign-id']);
            const issued = await store.users.issueFeedToken(
              localActor(),
              values.name,
              campaignId,
              values.label ?? 'calendar feed',
            );
            return `feed token for campaign ${campaignId} (token id ${issued.tokenId}), shown once: ${issued.secret}\nsubscribe to /api/campaigns/${campaignId}/calendar.ics?token=${issued.secret}\n`;
          }
          case 'list': {
            const page = await store.users.list({ limit: 500 });
            return render(
              outputFormat(values),
              page.items,
              [
                { header: 'id', value: (u) => u.id },
                { header: 'name', value: (u) => u.name },
                { header: 'role', value: (u) => u.role },
                { header: 'created (UTC)', value: (u) => u.createdAt },
              ],
              page.items,
            );
          }
          case 'tokens': {
            const rows = await store.users
              .listTokens(values.name)
              .catch(
                asInputError('--name', values.name, 'does not name a user (see `account list`)'),
              );
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
            const t = await store.users
              .revokeToken(localActor(), id)
              .catch(
                asInputError(
                  '--token-id',
                  values['token-id'],
                  'does not name an active token (see `account tokens`)',
                ),
              );
            return `revoked token ${t.id} (${JSON.stringify(t.label)}) of ${JSON.stringify(t.userName)} at ${t.revokedAt ?? ''}; it no longer signs in.\n`;
          }
          default:
            throw new UsageError(
              `account: say add, token, list, tokens or revoke${action ? ` (not ${JSON.stringify(action)})` : ''}`,
            );
        }
      },
      { writes: ['add', 'token', 'feed-token', 'revoke'].includes(action ?? '') },
    );
  },
};
