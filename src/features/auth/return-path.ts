/**
 * Where to go after signing in. The provider round-trip lands on `/`, so the page the user
 * asked for (e.g. an invitation link) is kept in sessionStorage across it.
 */
const KEY = 'pointfold.after-sign-in';

/** Only same-site paths are remembered, never a full URL (no open redirect). */
export function isSafePath(path: string | null | undefined): path is string {
  return !!path && path.startsWith('/') && !path.startsWith('//') && !path.startsWith('/sign-in');
}

export function rememberReturnPath(path: string | null | undefined): void {
  try {
    if (isSafePath(path)) sessionStorage.setItem(KEY, path);
  } catch {
    /* storage disabled: the user lands on their first workspace instead */
  }
}

export function takeReturnPath(): string | null {
  try {
    const path = sessionStorage.getItem(KEY);
    sessionStorage.removeItem(KEY);
    return isSafePath(path) ? path : null;
  } catch {
    return null;
  }
}
