import { Router } from 'express';
import { In } from 'typeorm';
import * as z from 'zod';
import { devMailMessageSchema } from '@shared/contracts/api';
import type { AppDeps } from '../../app';
import { DomainError, notFound } from '../../errors';
import { User } from '../users/entity';
import { workspaceAccess } from '../workspaces/access';
import { Membership } from '../workspaces/entity';
import { Invitation } from '../workspaces/invitation.entity';
import { slugParams } from '../workspaces/params';

const inboxMessage = z.object({
  id: z.union([z.string(), z.number()]).transform(String),
  from: z.string().default(''),
  to: z.union([z.string(), z.array(z.string())]).transform((v) => (Array.isArray(v) ? v.join(', ') : v)),
  subject: z.string().default(''),
  text: z.string().default(''),
  date: z.string(),
});

/**
 * GET /api/workspaces/:slug/dev-mailbox (owners; only when DEV_MAILBOX=true): the local fake
 * inbox, limited to mail addressed to this workspace's members and invitees, so a demo can
 * follow an invitation without a real mail account. Text only: the HTML part is not relayed.
 */
export function createDevMailboxRouter(deps: AppDeps): Router {
  const router = Router();
  router.get('/workspaces/:slug/dev-mailbox', workspaceAccess(deps.dataSource, ['owner']), async (req, res) => {
    slugParams.parse(req.params);
    if (!deps.config.DEV_MAILBOX) throw notFound('The development mailbox is switched off');
    const workspaceId = req.access!.workspace.id;
    const memberIds = (await deps.dataSource.getRepository(Membership).findBy({ workspaceId })).map((m) => m.userId);
    const members = memberIds.length ? await deps.dataSource.getRepository(User).findBy({ id: In(memberIds) }) : [];
    const invitees = await deps.dataSource.getRepository(Invitation).findBy({ workspaceId });
    const addresses = new Set([...members.map((u) => u.email), ...invitees.map((i) => i.email)].map((e) => e.toLowerCase()));

    let body: unknown;
    try {
      const response = await fetch(`${deps.config.DEV_MAILBOX_URL.replace(/\/$/, '')}/messages`, { signal: AbortSignal.timeout(5000) });
      if (!response.ok) throw new Error(`status ${response.status}`);
      body = await response.json();
    } catch (err) {
      deps.logger.warn({ err }, 'development mailbox unreachable');
      throw new DomainError('unavailable', 'The development mailbox is not reachable');
    }
    const messages = z.array(inboxMessage).parse(body);
    const mine = messages.filter((m) =>
      m.to.toLowerCase().split(/[\s,;<>]+/).some((part) => addresses.has(part)),
    );
    res.json(z.array(devMailMessageSchema).parse(mine.sort((a, b) => b.date.localeCompare(a.date))));
  });
  return router;
}
