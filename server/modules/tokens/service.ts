import { randomBytes } from 'node:crypto';
import { In, type DataSource, type EntityManager } from 'typeorm';
import type * as z from 'zod';
import type { apiTokenSchema } from '@shared/contracts/api';
import { notFound } from '../../errors';
import { hashToken } from '../../middleware/authenticate';
import { recordAudit } from '../audit/service';
import { User } from '../users/entity';
import { UUID_PATTERN, type WorkspaceAccess } from '../workspaces/access';
import { Membership } from '../workspaces/entity';
import { ApiToken } from './entity';

type ApiTokenDto = z.infer<typeof apiTokenSchema>;

/** Prefix of every token secret, so leaked tokens are easy to recognise (and to scan for). */
export const TOKEN_PREFIX = 'pf_';

/** A new secret: `pf_` + 32 random bytes, base64url (256 bits of entropy). */
export function newTokenSecret(): string {
  return TOKEN_PREFIX + randomBytes(32).toString('base64url');
}

export function toApiTokenDto(t: ApiToken, user?: Pick<User, 'id' | 'name' | 'login'>): ApiTokenDto {
  return {
    id: t.id,
    label: t.label,
    createdAt: t.createdAt.toISOString(),
    lastUsedAt: t.lastUsedAt?.toISOString() ?? null,
    revokedAt: t.revokedAt?.toISOString() ?? null,
    ...(user ? { user: { id: user.id, name: user.name, login: user.login } } : {}),
  };
}

/**
 * Issues a personal API token for a member of a workspace. The secret is returned once and
 * only its SHA-256 is stored. Throws not-found when the user is not a member. Used by the
 * token routes and by the operator command `token create`.
 *
 * @param actorId who issued it, for the audit log (default: the user; null for the operator).
 */
export async function issueApiToken(
  db: DataSource | EntityManager,
  input: { userId: string; workspaceId: string; label: string; actorId?: string | null },
): Promise<{ token: string; record: ApiToken }> {
  const member = await db.getRepository(Membership).findOneBy({ userId: input.userId, workspaceId: input.workspaceId });
  if (!member) throw notFound('That user is not a member of the workspace');
  const token = newTokenSecret();
  const repo = db.getRepository(ApiToken);
  const record = await repo.save(
    repo.create({ userId: input.userId, workspaceId: input.workspaceId, label: input.label, tokenHash: hashToken(token), lastUsedAt: null, revokedAt: null }),
  );
  await recordAudit(db, {
    workspaceId: input.workspaceId,
    actorId: input.actorId === undefined ? input.userId : input.actorId,
    action: 'token.created',
    detail: { tokenId: record.id, label: record.label, userId: input.userId },
  });
  return { token, record };
}

/** Listing and revoking a workspace's tokens: owners see and revoke all, others their own. */
export function createTokenService(deps: { dataSource: DataSource }) {
  const ds = deps.dataSource;
  return {
    async list(access: WorkspaceAccess, userId: string): Promise<ApiTokenDto[]> {
      const tokens = await ds.getRepository(ApiToken).find({
        where: { workspaceId: access.workspace.id, ...(access.role === 'owner' ? {} : { userId }) },
        order: { createdAt: 'DESC' },
      });
      const users = tokens.length ? await ds.getRepository(User).findBy({ id: In([...new Set(tokens.map((t) => t.userId))]) }) : [];
      const byId = new Map(users.map((u) => [u.id, u]));
      return tokens.map((t) => toApiTokenDto(t, byId.get(t.userId)));
    },

    async create(access: WorkspaceAccess, userId: string, label: string): Promise<ApiTokenDto & { token: string }> {
      const { token, record } = await ds.transaction((manager) =>
        issueApiToken(manager, { userId, workspaceId: access.workspace.id, label }),
      );
      const user = await ds.getRepository(User).findOneByOrFail({ id: userId });
      return { ...toApiTokenDto(record, user), token };
    },

    /** Revokes a token of this workspace. Another workspace's token is "not found" here. */
    async revoke(access: WorkspaceAccess, actorId: string, tokenId: string): Promise<ApiTokenDto> {
      if (!UUID_PATTERN.test(tokenId)) throw notFound('No such token');
      return ds.transaction(async (manager) => {
        const repo = manager.getRepository(ApiToken);
        const token = await repo.findOneBy({ id: tokenId, workspaceId: access.workspace.id });
        if (!token) throw notFound('No such token');
        if (token.userId !== actorId && access.role !== 'owner') throw notFound('No such token');
        if (!token.revokedAt) {
          token.revokedAt = new Date();
          await repo.save(token);
          await recordAudit(manager, {
            workspaceId: access.workspace.id,
            actorId,
            action: 'token.revoked',
            detail: { tokenId: token.id, label: token.label, userId: token.userId },
          });
        }
        return toApiTokenDto(token);
      });
    },
  };
}
