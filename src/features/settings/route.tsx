import type { LoaderFunctionArgs } from 'react-router-dom';
import { meQueryOptions } from '@/lib/me';
import { exportTemplatesQueryOptions } from '@/lib/export-templates';
import { queryClient } from '@/lib/query-client';
import { invitationsQueryOptions } from './api/get-invitations';
import { membersQueryOptions } from './api/get-members';
import { tokensQueryOptions } from './api/get-tokens';
import { SettingsPage } from './components/settings-page';

/** Lazy route module for `/w/:slug/settings`: warms members and tokens (and invitations for owners). */
export async function loader({ params }: LoaderFunctionArgs) {
  const slug = params.slug!;
  const me = await queryClient.ensureQueryData(meQueryOptions());
  const owner = me.memberships.some((m) => m.workspace.slug === slug && m.role === 'owner');
  await Promise.all([
    queryClient.ensureQueryData(membersQueryOptions(slug)),
    queryClient.ensureQueryData(tokensQueryOptions(slug)),
    owner ? queryClient.ensureQueryData(invitationsQueryOptions(slug)) : null,
  ]);
  // Warmed, not awaited: the rest of the page must not wait for (or fail with) the templates.
  if (owner) void queryClient.prefetchQuery(exportTemplatesQueryOptions(slug));
  return null;
}

export const Component = SettingsPage;
