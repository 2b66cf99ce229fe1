import { queryKeys } from '@/lib/query-keys';

/** `/api/workspaces/<slug>` with the slug escaped. */
export const workspacePath = (slug: string) => `/api/workspaces/${encodeURIComponent(slug)}`;

/** Query keys of the settings page, under the workspace's root. */
export const settingsKeys = {
  members: (slug: string) => [...queryKeys.workspace(slug), 'members'] as const,
  invitations: (slug: string) => [...queryKeys.workspace(slug), 'invitations'] as const,
  tokens: (slug: string) => [...queryKeys.workspace(slug), 'tokens'] as const,
  audit: (slug: string) => [...queryKeys.workspace(slug), 'audit'] as const,
  devMailbox: (slug: string) => [...queryKeys.workspace(slug), 'dev-mailbox'] as const,
};
