import { useSearchParams } from 'react-router-dom';
import { buttonClass } from '@/components/ui/button';
import { NameMark } from '@/components/ui/name-mark';

/**
 * The sign-in page: one button that starts the provider's OAuth flow (in development, the local
 * fake provider that offers the demo accounts). A full navigation, not fetch: OAuth redirects.
 */
export function SignInPage() {
  const [params] = useSearchParams();
  const next = params.get('next');
  const failed = params.get('error');
  // The server keeps `returnTo` in the session across the provider round trip (same-site paths only).
  const href = isSamePath(next) ? `/auth/github?returnTo=${encodeURIComponent(next)}` : '/auth/github';
  return (
    <main className="flex min-h-screen items-center justify-center bg-paper px-4">
      <div className="w-full max-w-sm rounded-xl border border-rule bg-card p-8 shadow-sm">
        <NameMark />
        <h1 className="mt-8 text-xl font-semibold">Sign in to your workspace</h1>
        <p className="mt-2 text-sm text-ink-soft">
          Snap batches of optimized geometries onto exact point-group symmetry, with your team.
        </p>
        {failed && (
          <p role="alert" className="mt-4 rounded-md bg-brick-wash px-3 py-2 text-sm text-brick">
            {failureMessages[failed] ?? failureMessages.provider}
          </p>
        )}
        <a
          href={href}
          className={buttonClass('primary', 'md', 'mt-6 w-full')}
        >
          <KeyGlyph />
          Sign in with GitHub
        </a>
        <p className="mt-6 text-xs text-ink-soft">
          New here? Ask a workspace owner for an invitation; the link in the e-mail brings you back after sign-in.
        </p>
      </div>
    </main>
  );
}

/** Codes the server puts in `/sign-in?error=` when the provider round trip fails. */
const failureMessages: Record<string, string> = {
  cancelled: 'Sign-in was cancelled. Try again when you’re ready.',
  state: 'The sign-in took too long or was started in another tab. Try again.',
  'no-verified-email': 'Your account has no verified e-mail address with the provider; Pointfold needs one.',
  'account-conflict': 'That e-mail address already belongs to another Pointfold account.',
  provider: 'The sign-in provider could not be reached. Try again in a moment.',
};

function isSamePath(path: string | null): path is string {
  return !!path && path.startsWith('/') && !path.startsWith('//') && !path.startsWith('/sign-in');
}

function KeyGlyph() {
  // A key, not the provider's logo: the button text names the provider.
  return (
    <svg viewBox="0 0 20 20" aria-hidden className="size-4" fill="none" stroke="currentColor" strokeWidth="1.8">
      <circle cx="7" cy="10" r="3.5" />
      <path d="M10.5 10H18M15 10v3M17.5 10v2" strokeLinecap="round" />
    </svg>
  );
}
