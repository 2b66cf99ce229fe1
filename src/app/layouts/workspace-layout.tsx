import { Outlet, useParams } from 'react-router-dom';
import { useMe } from '@/lib/me';
import { WorkspaceContext } from '@/lib/workspace-context';
import { NotFoundPage } from '../pages/not-found-page';

/** `/w/:slug`: provides the workspace and the caller's role to every page inside it. */
export function WorkspaceLayout() {
  const me = useMe();
  const { slug } = useParams();
  const membership = me.memberships.find((m) => m.workspace.slug === slug);
  if (!membership) return <NotFoundPage />;
  return (
    <WorkspaceContext.Provider value={{ workspace: membership.workspace, role: membership.role, user: me.user }}>
      <Outlet />
    </WorkspaceContext.Provider>
  );
}
