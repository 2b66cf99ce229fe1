import { parseArgs } from 'node:util';
import { loadConfig } from '../config';
import { createDataSource } from '../db/data-source';
import { issueApiToken } from '../modules/tokens/service';
import { User } from '../modules/users/entity';
import { Membership, Workspace } from '../modules/workspaces/entity';

const USAGE = 'usage: pointfold token create --email EMAIL [--workspace SLUG] [--label TEXT]';

/**
 * `pointfold token create --email EMAIL [--workspace SLUG]`: an operator command on the local
 * database (DATABASE_URL) that prints a new API token for that user in one of their workspaces.
 * The token goes to stdout alone on its line (for `$(…)`); everything else to stderr.
 */
export async function run(argv: string[]): Promise<number> {
  const args = argv[0] === 'token' ? argv.slice(1) : argv;
  let parsed;
  try {
    parsed = parseArgs({
      args,
      allowPositionals: true,
      options: { email: { type: 'string' }, workspace: { type: 'string' }, label: { type: 'string' }, help: { type: 'boolean', short: 'h' } },
    });
  } catch (e) {
    process.stderr.write(`pointfold token: ${(e as Error).message}\n${USAGE}\n`);
    return 2;
  }
  const { values, positionals } = parsed;
  if (values.help) {
    process.stdout.write(`${USAGE}\n`);
    return 0;
  }
  if (positionals[0] !== 'create' || positionals.length > 1 || !values.email) {
    process.stderr.write(`pointfold token: ${positionals[0] && positionals[0] !== 'create' ? `unknown subcommand '${positionals[0]}'` : 'missing --email'}\n${USAGE}\n`);
    return 2;
  }

  const config = loadConfig();
  const dataSource = createDataSource(config.DATABASE_URL);
  try {
    await dataSource.initialize();
  } catch (e) {
    process.stderr.write(`pointfold token: cannot reach the database at ${redact(config.DATABASE_URL)} (${(e as Error).message})\n`);
    return 1;
  }
  try {
    const email = values.email.trim().toLowerCase();
    const user = await dataSource.getRepository(User).createQueryBuilder('u').where('lower(u.email) = :email', { email }).getOne();
    if (!user) {
      process.stderr.write(`pointfold token: no user with the e-mail ${values.email}\n`);
      return 1;
    }
    const memberships = await dataSource
      .getRepository(Membership)
      .createQueryBuilder('m')
      .innerJoin(Workspace, 'w', 'w.id = m.workspace_id')
      .select(['m.workspace_id AS workspace_id', 'w.slug AS slug', 'm.role AS role'])
      .where('m.user_id = :userId', { userId: user.id })
      .orderBy('w.slug')
      .getRawMany<{ workspace_id: string; slug: string; role: string }>();
    let chosen = memberships[0];
    if (values.workspace) {
      chosen = memberships.find((m) => m.slug === values.workspace)!;
      if (!chosen) {
        process.stderr.write(`pointfold token: ${user.email} is not a member of a workspace '${values.workspace}'\n`);
        return 1;
      }
    } else if (memberships.length !== 1) {
      process.stderr.write(
        memberships.length === 0
          ? `pointfold token: ${user.email} belongs to no workspace\n`
          : `pointfold token: ${user.email} belongs to several workspaces (${memberships.map((m) => m.slug).join(', ')}); choose one with --workspace\n`,
      );
      return 1;
    }
    const { token } = await issueApiToken(dataSource, {
      userId: user.id,
      workspaceId: chosen.workspace_id,
      label: values.label?.trim() || 'created with `pointfold token create`',
      actorId: null,
    });
    process.stderr.write(`API token for ${user.email} in workspace '${chosen.slug}' (role ${chosen.role}); it is shown once:\n`);
    process.stdout.write(`${token}\n`);
    return 0;
  } finally {
    await dataSource.destroy();
  }
}

/** The URL without its password, for messages. */
function redact(url: string): string {
  try {
    const u = new URL(url);
    if (u.password) u.password = '***';
    return u.toString();
  } catch {
    return 'DATABASE_URL';
  }
}
