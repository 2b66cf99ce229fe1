import type { LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '@/lib/query-client';
import { invitationQueryOptions } from './api/get-invitation';
import { InvitationPage } from './components/invitation-page';

/** Lazy route module for `/invite/:token` (public: the page explains the link before sign-in). */
export async function loader({ params }: LoaderFunctionArgs) {
  // prefetch, not ensure: a bad link is shown in the page, not as an error page.
  await queryClient.prefetchQuery(invitationQueryOptions(params.token ?? ''));
  return null;
}

export const Component = InvitationPage;
