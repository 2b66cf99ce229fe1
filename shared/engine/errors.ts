/**
 * Domain errors of the symmetry engine. Every message is one line, names the offending atom or
 * value where there is one, and never includes a stack-like dump: callers show it verbatim
 * (CLI stderr, the batch table, the API).
 */

/** Codes of {@link EngineError}. */
export const engineErrorCodes = [
  'empty', // no atoms
  'bad-coordinates', // NaN, Infinity, |x| > 1e6 Å, or implausibly dense packing
  'unknown-element', // an element symbol or number the element table does not know
  'coincident-atoms', // two atoms closer than 0.01 Å
  'too-many-atoms', // more than MAX_ATOMS atoms
  'unknown-group', // a group name that is not a point group
  'target-not-allowed', // a target group the structure cannot be snapped to
  'bad-settings', // snap settings that fail their schema
  'write-check-failed', // a written file re-perceived to a different group (used by shared/formats)
  'internal', // a bug of ours; the message says what failed
] as const;

/** One of {@link engineErrorCodes}. */
export type EngineErrorCode = (typeof engineErrorCodes)[number];

/** A bad input or request, with a machine-readable code and a one-line human message. */
export class EngineError extends Error {
  readonly code: EngineErrorCode;

  constructor(code: EngineErrorCode, message: string) {
    super(message.replace(/\s*\n\s*/g, ' '));
    this.name = 'EngineError';
    this.code = code;
  }
}

/** True if `e` is an {@link EngineError} (also across module copies, by name and code). */
export function isEngineError(e: unknown): e is EngineError {
  return e instanceof EngineError || (e instanceof Error && e.name === 'EngineError' && 'code' in e);
}
