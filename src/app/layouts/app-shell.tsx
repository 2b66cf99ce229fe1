import { Suspense } from 'react';
import { NavLink, Outlet, useNavigate, useNavigation, useParams } from 'react-router-dom';
import { useMe } from '@/lib/me';
import { useSignOut } from '@/features/auth/api/sign-out';
import { WorkspaceSwitcher } from '@/features/workspaces/components/workspace-switcher';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { focusRing } from '@/components/ui/focus';
import { NameMark } from '@/components/ui/name-mark';
import { PageSpinner } from '@/components/ui/spinner';
import { InlineError } from '@/components/ui/states';
import { cx } from '@/lib/cx';
import { canWrite, isOwner } from '@/lib/workspace-context';

/**
 * The signed-in frame: a narrow rail on the left (name mark, workspace switcher, the
 * workspace's pages, who you are and your role) and the page on paper to the right.
 */
export function AppShell() {
  const me = useMe();
  const { slug } = useParams();
  const navigate = useNavigate();
  const navigation = useNavigation();
  const signOut = useSignOut({ onDone: () => navigate('/sign-in', { replace: true }) });
  const membership = me.memberships.find((m) => m.workspace.slug === slug);
  const base = slug ? `/w/${encodeURIComponent(slug)}` : null;

  return (
    <div className="flex min-h-screen bg-paper text-ink">
      <a href="#content" className={cx('sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:z-50 focus:rounded focus:bg-card focus:px-3 focus:py-2', focusRing)}>
        Skip to content
      </a>
      {navigation.state === 'loading' && (
        <div role="progressbar" aria-label="Loading page" className="fixed inset-x-0 top-0 z-40 h-0.5 animate-pulse bg-saffron" />
      )}
      <aside className="w-60 shrink-0 border-r border-rule bg-paper-deep/70">
        <div className="sticky top-0 flex h-screen flex-col gap-6 px-4 py-5">
          <NavLink to="/" className={cx('rounded-md', focusRing)} aria-label="Pointfold home">
            <NameMark />
          </NavLink>
          <WorkspaceSwitcher memberships={me.memberships} currentSlug={slug} onSwitch={(s) => navigate(`/w/${encodeURIComponent(s)}`)} />
          {base && membership && (
            <nav aria-label="Workspace" className="flex flex-col gap-0.5">
              <RailLink to={base} end>
                Batches
              </RailLink>
              {canWrite(membership.role) && <RailLink to={`${base}/new`}>New batch</RailLink>}
              <RailLink to={`${base}/settings`}>{isOwner(membership.role) ? 'Settings' : 'API tokens'}</RailLink>
            </nav>
          )}
          <div className="mt-auto flex flex-col gap-2 border-t border-rule pt-4 text-sm">
            <div className="min-w-0">
              <div className="truncate font-medium" title={me.user.email}>
                {me.user.name || me.user.login}
              </div>
              <div className="truncate text-xs text-ink-soft">{me.user.email}</div>
            </div>
            {membership && (
              <div className="flex items-center gap-1.5 text-xs text-ink-soft">
                <span>Your role:</span>
                <Badge tone={membership.role === 'owner' ? 'saffron' : membership.role === 'chemist' ? 'lapis' : 'neutral'}>
                  {membership.role}
                </Badge>
              </div>
            )}
            <Button variant="secondary" size="sm" busy={signOut.isPending} onClick={() => signOut.mutate()}>
              Sign out
            </Button>
            {signOut.isError && <InlineError>{signOut.error.message}</InlineError>}
          </div>
        </div>
      </aside>
      <main id="content" className="min-w-0 flex-1 px-8 py-7">
        <div className="mx-auto max-w-6xl">
          <Suspense fallback={<PageSpinner />}>
            <Outlet />
          </Suspense>
        </div>
      </main>
    </div>
  );
}

function RailLink({ to, end, children }: { to: string; end?: boolean; children: string }) {
  return (
    <NavLink
      to={to}
      end={end}
      className={({ isActive }) =>
        cx(
          'rounded-md px-3 py-2 text-sm font-medium',
          focusRing,
          isActive ? 'bg-card text-lapis-deep shadow-[inset_3px_0_0_var(--color-saffron)]' : 'text-ink-soft hover:bg-card/70 hover:text-ink',
        )
      }
    >
      {children}
    </NavLink>
  );
}
