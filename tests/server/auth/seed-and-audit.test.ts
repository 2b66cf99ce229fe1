import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEntry } from '../../../server/modules/audit/entity';
import { recordAudit } from '../../../server/modules/audit/service';
import { User } from '../../../server/modules/users/entity';
import { Membership } from '../../../server/modules/workspaces/entity';
import { seedDemoWorkspace } from '../../../server/modules/workspaces/seed';
import { createTestDatabase, type TestDatabase } from '../../support/db';

describe('demo seed and audit log', () => {
  let db: TestDatabase;
  beforeAll(async () => {
    db = await createTestDatabase();
  });
  afterAll(async () => {
    await db.drop();
  });

  it('seeds the demo workspace with one owner, chemist and reviewer, and is idempotent', async () => {
    const first = await seedDemoWorkspace(db.dataSource);
    const second = await seedDemoWorkspace(db.dataSource);
    expect(second).toEqual(first);
    const members = await db.dataSource.getRepository(Membership).findBy({ workspaceId: first.workspaceId });
    expect(members.map((m) => m.role).sort()).toEqual(['chemist', 'owner', 'reviewer']);
    const owner = await db.dataSource.getRepository(User).findOneByOrFail({ id: first.users.owner });
    expect(owner).toMatchObject({ email: 'owner@example.org', login: 'demo-owner' });
  });

  it('records an audit entry inside a transaction and drops it when the transaction rolls back', async () => {
    const { workspaceId, users } = await seedDemoWorkspace(db.dataSource);
    await recordAudit(db.dataSource, { workspaceId, actorId: users.owner, action: 'token.created', detail: { label: 'cluster' } });
    await expect(
      db.dataSource.transaction(async (manager) => {
        await recordAudit(manager, { workspaceId, actorId: users.owner, action: 'token.revoked' });
        throw new Error('roll back');
      }),
    ).rejects.toThrow('roll back');
    const entries = await db.dataSource.getRepository(AuditEntry).findBy({ workspaceId });
    expect(entries.map((e) => [e.action, e.detail])).toEqual([['token.created', { label: 'cluster' }]]);
  });
});
