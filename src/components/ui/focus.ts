/** The one visible focus ring used by every interactive element (WCAG 2.4.7). */
export const focusRing =
  'focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-lapis focus-visible:outline-solid';
