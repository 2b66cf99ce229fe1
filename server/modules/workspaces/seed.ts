import type { DataSource, EntityManager } from 'typeorm';
import type { Role } from '@shared/contracts/api';
import { User } from '../users/entity';
import { Membership, Workspace } from './entity';

/** The demo accounts: the fake OAuth provider offers the same logins and e-mails. */
export const DEMO_ACCOUNTS: readonly { role: Role; login: string; email: string; name: string }[] = [
  { role: 'owner', login: 'demo-owner', email: 'owner@example.org', name: 'Demo Owner' },
  { role: 'chemist', login: 'demo-chemist', email: 'chemist@example.org', name: 'Demo Chemist' },
  { role: 'reviewer', login: 'demo-reviewer', email: 'reviewer@example.org', name: 'Demo Reviewer' },
];

export const DEMO_WORKSPACE = { slug: 'demo', name: 'Demo group' } as const;

async function upsertUser(manager: EntityManager, account: (typeof DEMO_ACCOUNTS)[number]): Promise<User> {
  const users = manager.getRepository(User);
  const existing = await users.findOneBy({ email: account.email });
  if (existing) return existing;
  return users.save(users.create({ login: account.login, email: account.email, name: account.name, providerId: null }));
}

/**
 * Creates the `demo` workspace and its three accounts (owner, chemist, reviewer) if they are
 * missing. Idempotent: running it again changes nothing and returns the same ids. Existing
 * memberships keep the role an owner may have given them since.
 */
export async function seedDemoWorkspace(
  dataSource: DataSource,
): Promise<{ workspaceId: string; users: Record<'owner' | 'chemist' | 'reviewer', string> }> {
  return dataSource.transaction(async (manager) => {
    const workspaces = manager.getRepository(Workspace);
    const memberships = manager.getRepository(Membership);
    // ON CONFLICT keeps two concurrent start-ups from both inserting the workspace.
    await workspaces
      .createQueryBuilder()
      .insert()
      .values({ slug: DEMO_WORKSPACE.slug, name: DEMO_WORKSPACE.name, defaults: {} })
      .orIgnore()
      .execute();
    const workspace = await workspaces.findOneByOrFail({ slug: DEMO_WORKSPACE.slug });

    const users = {} as Record<Role, string>;
    for (const account of DEMO_ACCOUNTS) {
      const user = await upsertUser(manager, account);
      users[account.role] = user.id;
      await memberships
        .createQueryBuilder()
        .insert()
        .values({ workspaceId: workspace.id, userId: user.id, role: account.role })
        .orIgnore()
        .execute();
    }
    return { workspaceId: workspace.id, users };
  });
}
