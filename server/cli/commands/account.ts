/** `epochwright account`: create users with a role, issue and list tokens (secrets shown once). */
import { parseArgs } from 'node:util';
import { LOCAL_OPERATOR } from '../../store/index.ts';
import { UsageError, outputFormat, type Command } from '../io.ts';
import { render } from '../output.ts';
import { DATABASE_HELP, databaseOption, withStore } from './store-option.ts';

const help = `usage: epochwright account add --name <name> --role lead|observer|viewer
       epochwright account token --name <name> [--label <text>]
       epochwright account list [--json|--csv]

add     creates a user and prints its first bearer token (shown this once; only a hash is kept)
token   issues a further token for an existing user
list    shows the users and their roles

roles: lead edits orbits, campaigns and sites; observer writes nights, blocks, reports and
measurements; viewer reads.

options:
${DATABASE_HELP}
`;

export const accountCommand: Command = {
  summary: 'create users with a role and issue their bearer tokens',
  help,
  async run(argv) {
    const { values, positionals } = parseArgs({
      args: argv,
      options: { ...databaseOption, name: { type: 'string' }, role: { type: 'string' }, label: { type: 'string' }, json: { type: 'boolean' }, csv: { type: 'boolean' } },
      strict: true,
      allowPositionals: true,
    });
    const [action, ...extra] = positionals;
    if (extra.length) throw new UsageError(`unexpected ${JSON.stringify(extra[0])}`);
    return withStore(values.database, async (store) => {
      switch (action) {
        case 'add': {
          if (values.name === undefined || values.role === undefined) throw new UsageError('account add needs --name and --role');
          const issued = await store.users.createWithToken(LOCAL_OPERATOR, { name: values.name, role: values.role }, values.label ?? 'created at the command line');
          return `created ${issued.user.role} ${JSON.stringify(issued.user.name)} (id ${issued.user.id}).\ntoken (shown once): ${issued.secret}\n`;
        }
        case 'token': {
          if (values.name === undefined) throw new UsageError('account token needs --name');
          const issued = await store.users.issueToken(LOCAL_OPERATOR, values.name, values.label ?? 'issued at the command line');
          return `new token for ${JSON.stringify(issued.user.name)} (token id ${issued.tokenId}), shown once: ${issued.secret}\n`;
        }
        case 'list': {
          const page = await store.users.list({ limit: 500 });
          return render(outputFormat(values), page.items, [
            { header: 'id', value: (u) => u.id },
            { header: 'name', value: (u) => u.name },
            { header: 'role', value: (u) => u.role },
            { header: 'created (UTC)', value: (u) => u.createdAt },
          ], page.items);
        }
        default:
          throw new UsageError(`account: say add, token or list${action ? ` (not ${JSON.stringify(action)})` : ''}`);
      }
    });
  },
};
