import { ButtonLink } from '@/components/ui/button';
import { FoldGlyph } from '@/components/ui/states';

/**
 * One page for "doesn't exist" and "isn't yours": the API answers 404 for another workspace's
 * data, and saying which of the two it was would leak that it exists.
 */
export function NotFoundPage() {
  return (
    <div className="flex min-h-[60vh] flex-col items-center justify-center gap-4 px-6 text-center">
      <FoldGlyph className="size-12" />
      <h1 className="text-2xl font-semibold">Not found — or not yours</h1>
      <p className="max-w-md text-sm text-ink-soft">
        This page doesn’t exist, or it belongs to a workspace you’re not a member of. If someone sent you the link, ask a
        workspace owner for an invitation.
      </p>
      <ButtonLink to="/" variant="secondary">
        Back to my workspace
      </ButtonLink>
    </div>
  );
}
