/** `veer tokens add|list|revoke`: manage API tokens in the local store (the data folder, or DATABASE_URL). */
import { hostname, userInfo } from 'node:os';
import { parseArgs } from 'node:util';
import { openTokenStore, ROLES, type Role, type TokenRecord } from '../../api/auth/index.ts';
import type { CliCommand } from '../command.ts';
import { UsageError } from './remote-api.ts';

const USAGE = `usage: veer tokens add <name> --role ROLE [--role ROLE ...]
       veer tokens list
       veer tokens revoke <tokenId>
options: [--data-dir DIR | --database-url URL] [--json]

Manages bearer tokens in the store the API uses: PostgreSQL when --database-url (or $DATABASE_URL) is set,
else tokens.sqlite in --data-dir (or $DATA_DIR, else ./data). Only a SHA-256 hash of each token is kept:
\`add\` prints the token once — copy it then; it cannot be shown again. Roles: ${ROLES.join(', ')}.`;

function row(t: TokenRecord): string {
  return `${t.id}  ${t.name.padEnd(20)} ${t.roles.join(',').padEnd(34)} created ${t.createdAt}${t.createdBy ? ` by ${t.createdBy}` : ''}`
    + `${t.revokedAt ? `  REVOKED ${t.revokedAt}${t.revokedBy ? ` by ${t.revokedBy}` : ''}` : ''}`;
}

/** Who acts from this command line, for the tokens' audit trail: `cli:user@host`. */
function cliActor(): string {
  let user = process.env.USER ?? 'unknown';
  try { user = userInfo().username; } catch { /* no passwd entry: keep $USER */ }
  return `cli:${user}@${hostname()}`;
}

export const tokensCommand: CliCommand = {
  name: 'tokens',
  usage: USAGE,
  async run(args) {
    const { values, positionals } = parseArgs({
      args, allowPositionals: true,
      options: { role: { type: 'string', multiple: true }, 'data-dir': { type: 'string' }, 'database-url': { type: 'string' }, json: { type: 'boolean', default: false } },
    });
    const [action, arg] = positionals;
    if (!['add', 'list', 'revoke'].includes(action ?? '')) throw new UsageError('action', 'expected add, list or revoke\n\n' + USAGE);
    const store = await openTokenStore({ dataDir: values['data-dir'], databaseUrl: values['database-url'] });
    try {
      if (action === 'add') {
        if (!arg) throw new UsageError('name', 'veer tokens add needs a name');
        const roles = (values.role ?? []).flatMap((r) => r.split(',')).map((r) => r.trim()).filter(Boolean) as Role[];
        const { token, record } = await store.add(arg, roles, cliActor());
        if (values.json) process.stdout.write(JSON.stringify({ token, record }, null, 2) + '\n');
        else {
          process.stdout.write(`${row(record)}\n\ntoken (shown once, store it safely):\n${token}\n`);
        }
        return 0;
      }
      if (action === 'list') {
        const tokens = await store.list();
        process.stdout.write(values.json ? JSON.stringify(tokens, null, 2) + '\n' : (tokens.map(row).join('\n') || '(no tokens)') + '\n');
        return 0;
      }
      if (!arg) throw new UsageError('tokenId', 'veer tokens revoke needs a token id (see veer tokens list)');
      const record = await store.revoke(arg, cliActor());
      if (!record) { process.stderr.write(`veer tokens: no token ${arg}\n`); return 1; }
      process.stdout.write(values.json ? JSON.stringify(record, null, 2) + '\n' : `${row(record)}\n`);
      return 0;
    } finally {
      await store.close();
    }
  },
};
