import { EmptyState } from '@/components/ui/states';

/** `/` for someone who belongs to no workspace yet. */
export function NoWorkspacePage() {
  return (
    <EmptyState title="You’re not in a workspace yet — ask an owner for an invitation">
      An owner invites you by e-mail with a role. Open the link in that e-mail while signed in and the workspace appears here.
    </EmptyState>
  );
}
