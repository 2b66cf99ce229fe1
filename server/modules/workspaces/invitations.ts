import { createHmac, timingSafeEqual } from 'node:crypto';
import type { DataSource } from 'typeorm';
import * as z from 'zod';
import { invitationCreateSchema, invitationPeekSchema, invitationSchema, type Role } from '@shared/contracts/api';
import { publicUrl, type Config } from '../../config';
import { DomainError, notFound, forbidden } from '../../errors';
import type { Mailer } from '../../mail/mailer';
import { recordAudit } from '../audit/service';
import { User } from '../users/entity';
import { UUID_PATTERN, type WorkspaceAccess } from './access';
import { Membership, Workspace } from './entity';
import { Invitation } from './invitation.entity';

type InvitationDto = z.infer<typeof invitationSchema>;

/** Path of the invitation page in the web app; the e-mail links to `${PUBLIC_URL}/invite/<token>`. */
export const INVITE_PATH = '/invite/';

// ---- the link token: base64url(uuid bytes) "." base64url(HMAC-SHA256(secret, id)) ----------

function mac(secret: string, id: string): Buffer {
  return createHmac('sha256', secret).update(`pointfold-invitation:${id}`).digest();
}

/** The token in an invitation link: the invitation id signed with the server secret. */
export function signInvitation(secret: string, id: string): string {
  const idPart = Buffer.from(id.replace(/-/g, ''), 'hex').toString('base64url');
  return `${idPart}.${mac(secret, id).toString('base64url')}`;
}

/** The invitation id in a link token, or null when the token was not signed by this server. */
export function verifyInvitationToken(secret: string, token: string): string | null {
  const m = /^([A-Za-z0-9_-]{22})\.([A-Za-z0-9_-]{43})$/.exec(token);
  if (!m) return null;
  const hex = Buffer.from(m[1], 'base64url').toString('hex');
  if (hex.length !== 32) return null;
  const id = `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`;
  const given = Buffer.from(m[2], 'base64url');
  const expected = mac(secret, id);
  return given.length === expected.length && timingSafeEqual(given, expected) ? id : null;
}

export const toInvitationDto = (i: Invitation): InvitationDto => ({
  id: i.id,
  email: i.email,
  role: i.role,
  expiresAt: i.expiresAt.toISOString(),
  acceptedAt: i.acceptedAt?.toISOString() ?? null,
});

/** What the invitation page shows before (and after) sign-in. */
export type InvitationPeek = z.infer<typeof invitationPeekSchema>;

const INVALID = 'This invitation link is not valid: it may have been altered or cut short. Ask the owner for a new one';

/**
 * Invitations by e-mail: a signed, expiring, single-use link. Accepting requires signing in as
 * the invited address; it adds the membership with the invited role.
 */
export function createInvitationService(deps: { dataSource: DataSource; config: Config; mailer: Mailer }) {
  const ds = deps.dataSource;
  const secret = deps.config.SESSION_SECRET;

  async function load(token: string): Promise<Invitation> {
    const id = verifyInvitationToken(secret, token);
    if (!id) throw new DomainError('bad-request', INVALID);
    const invitation = await ds.getRepository(Invitation).findOneBy({ id });
    if (!invitation) throw notFound('This invitation no longer exists. Ask the owner for a new one');
    return invitation;
  }

  function statusOf(i: Invitation, now = new Date()): InvitationPeek['status'] {
    if (i.acceptedAt) return 'accepted';
    if (i.revokedAt) return 'revoked';
    if (i.expiresAt <= now) return 'expired';
    return 'pending';
  }

  return {
    async list(access: WorkspaceAccess): Promise<InvitationDto[]> {
      const rows = await ds.getRepository(Invitation).find({
        where: { workspaceId: access.workspace.id },
        order: { createdAt: 'DESC' },
        take: 200,
      });
      return rows.filter((i) => !i.revokedAt).map(toInvitationDto);
    },

    /**
     * Creates an invitation and mails the link. A newer invitation to the same address replaces
     * an older pending one (only the newest link works).
     */
    async create(access: WorkspaceAccess, actor: User, input: z.infer<typeof invitationCreateSchema>): Promise<InvitationDto> {
      const invitation = await ds.transaction(async (manager) => {
        const member = await manager
          .getRepository(Membership)
          .createQueryBuilder('m')
          .innerJoin(User, 'u', 'u.id = m.user_id')
          .where('m.workspace_id = :w AND lower(u.email) = :e', { w: access.workspace.id, e: input.email })
          .getOne();
        if (member) throw new DomainError('conflict', `${input.email} is already a member of this workspace`);
        const repo = manager.getRepository(Invitation);
        await repo
          .createQueryBuilder()
          .update()
          .set({ revokedAt: () => 'now()' })
          .where('workspace_id = :w AND email = :e AND accepted_at IS NULL AND revoked_at IS NULL', { w: access.workspace.id, e: input.email })
          .execute();
        const created = await repo.save(
          repo.create({
            workspaceId: access.workspace.id,
            email: input.email,
            role: input.role,
            invitedBy: actor.id,
            expiresAt: new Date(Date.now() + deps.config.INVITATION_TTL_HOURS * 3600_000),
            acceptedAt: null,
            acceptedBy: null,
            revokedAt: null,
          }),
        );
        await recordAudit(manager, {
          workspaceId: access.workspace.id,
          actorId: actor.id,
          action: 'invitation.created',
          detail: { invitationId: created.id, email: created.email, role: created.role },
        });
        return created;
      });

      const link = `${publicUrl(deps.config)}${INVITE_PATH}${signInvitation(secret, invitation.id)}`;
      const hours = deps.config.INVITATION_TTL_HOURS;
      const article = input.role === 'owner' ? 'an' : 'a';
      await deps.mailer.send({
        to: invitation.email,
        subject: `${actor.name} invited you to ${access.workspace.name} on Pointfold`,
        text:
          `${actor.name} (${actor.email}) invited you to join the workspace "${access.workspace.name}" on Pointfold as ${article} ${input.role}.\n\n` +
          `Accept the invitation: ${link}\n\n` +
          `Sign in with the account whose e-mail is ${invitation.email}. The link works once and expires in ${hours} hours.\n` +
          `If you were not expecting this, ignore this message.\n`,
      });
      return toInvitationDto(invitation);
    },

    async revoke(access: WorkspaceAccess, actorId: string, invitationId: string): Promise<void> {
      if (!UUID_PATTERN.test(invitationId)) throw notFound('No such invitation');
      await ds.transaction(async (manager) => {
        const repo = manager.getRepository(Invitation);
        const invitation = await repo.findOneBy({ id: invitationId, workspaceId: access.workspace.id });
        if (!invitation || invitation.revokedAt) throw notFound('No such invitation');
        if (invitation.acceptedAt) throw new DomainError('conflict', 'This invitation has already been accepted; remove the member instead');
        invitation.revokedAt = new Date();
        await repo.save(invitation);
        await recordAudit(manager, {
          workspaceId: access.workspace.id,
          actorId,
          action: 'invitation.revoked',
          detail: { invitationId, email: invitation.email },
        });
      });
    },

    /** Public: what a link is for, so the page can say "sign in as …" before anything else. */
    async peek(token: string): Promise<InvitationPeek> {
      const invitation = await load(token);
      const workspace = await ds.getRepository(Workspace).findOneByOrFail({ id: invitation.workspaceId });
      const inviter = await ds.getRepository(User).findOneBy({ id: invitation.invitedBy });
      return {
        workspace: { name: workspace.name, slug: workspace.slug },
        role: invitation.role,
        email: invitation.email,
        invitedBy: inviter?.name ?? 'A former member',
        expiresAt: invitation.expiresAt.toISOString(),
        status: statusOf(invitation),
      };
    },

    /** Accepts a link for the signed-in user; returns the workspace joined. */
    async accept(token: string, userId: string): Promise<{ workspace: { id: string; slug: string; name: string }; role: Role }> {
      const id = verifyInvitationToken(secret, token);
      if (!id) throw new DomainError('bad-request', INVALID);
      return ds.transaction(async (manager) => {
        // Row lock: two tabs accepting the same link at once must not both succeed.
        const invitation = await manager
          .getRepository(Invitation)
          .createQueryBuilder('i')
          .setLock('pessimistic_write')
          .where('i.id = :id', { id })
          .getOne();
        if (!invitation) throw notFound('This invitation no longer exists. Ask the owner for a new one');
        const status = statusOf(invitation);
        if (status === 'accepted') throw new DomainError('conflict', 'This invitation has already been used');
        if (status === 'revoked') throw new DomainError('conflict', 'This invitation was withdrawn or replaced by a newer one');
        if (status === 'expired') throw new DomainError('conflict', 'This invitation has expired. Ask the owner for a new one');
        const user = await manager.getRepository(User).findOneByOrFail({ id: userId });
        if (user.email.toLowerCase() !== invitation.email.toLowerCase()) {
          throw forbidden(`This invitation was sent to ${invitation.email}, but you are signed in as ${user.email}. Sign in with that account instead`);
        }
        const workspace = await manager.getRepository(Workspace).findOneByOrFail({ id: invitation.workspaceId });
        const memberships = manager.getRepository(Membership);
        const existing = await memberships.findOneBy({ workspaceId: workspace.id, userId });
        if (!existing) await memberships.save(memberships.create({ workspaceId: workspace.id, userId, role: invitation.role }));
        invitation.acceptedAt = new Date();
        invitation.acceptedBy = userId;
        await manager.getRepository(Invitation).save(invitation);
        await recordAudit(manager, {
          workspaceId: workspace.id,
          actorId: userId,
          action: 'member.joined',
          detail: { invitationId: invitation.id, role: existing?.role ?? invitation.role, invitedBy: invitation.invitedBy },
        });
        return { workspace: { id: workspace.id, slug: workspace.slug, name: workspace.name }, role: existing?.role ?? invitation.role };
      });
    },
  };
}
export type InvitationService = ReturnType<typeof createInvitationService>;
