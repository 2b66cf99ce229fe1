import { data, redirect, type LoaderFunctionArgs } from 'react-router-dom';
import { meQueryOptions } from '@/lib/me';
import { isApiError } from '@/lib/api-client';
import { queryClient } from '@/lib/query-client';

/** Every page but /sign-in needs a caller: load /api/me, or go to sign-in and come back. */
export async function requireMeLoader({ request }: LoaderFunctionArgs) {
  try {
    await queryClient.ensureQueryData(meQueryOptions());
  } catch (error) {
    if (isApiError(error, 401)) {
      const url = new URL(request.url);
      throw redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
    }
    throw error;
  }
  return null;
}

/** `/`: the first workspace, else the "no workspace" page. */
export async function homeLoader() {
  const me = await queryClient.ensureQueryData(meQueryOptions());
  const first = me.memberships[0];
  if (first) throw redirect(`/w/${encodeURIComponent(first.workspace.slug)}`);
  return null;
}

/** `/w/:slug`: a workspace the caller isn't in is answered like one that doesn't exist. */
export async function workspaceLoader({ params }: LoaderFunctionArgs) {
  const me = await queryClient.ensureQueryData(meQueryOptions());
  if (!me.memberships.some((m) => m.workspace.slug === params.slug)) throw data('Not found', { status: 404 });
  return null;
}
