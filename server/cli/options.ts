import { parseArgs, type ParseArgsConfig } from 'node:util';

/**
 * Option parsing shared by the commands. Exit statuses of the CLI (documented in `--help`):
 * 0 all structures done; 1 bad input (a file, frame or structure could not be used; the others
 * were still processed); 2 usage error (unknown command or option, bad option value).
 */
export const EXIT_OK = 0;
export const EXIT_BAD_INPUT = 1;
export const EXIT_USAGE = 2;

/** A usage mistake: printed as one line, exit status 2. */
export class UsageError extends Error {}

/** node:util parseArgs, strict, with its errors turned into one-line usage errors. */
export function parseCommandArgs<T extends NonNullable<ParseArgsConfig['options']>>(command: string, argv: string[], options: T) {
  try {
    return parseArgs({ args: argv, options, allowPositionals: true, strict: true });
  } catch (e) {
    const msg = (e as Error).message.split('\n')[0];
    const unknown = /Unknown option '([^']+)'/.exec(msg);
    const ambiguous = /Option '([^']+)' argument is ambiguous/.exec(msg);
    if (ambiguous) throw new UsageError(`pointfold ${command}: write a value that starts with '-' as ${ambiguous[1]}=VALUE`);
    const missing = /Option '([^']+?)(?: <value>)?' argument missing/.exec(msg);
    if (missing) throw new UsageError(`pointfold ${command}: ${missing[1].replace(/^-\w, /, '')} needs a value`);
    throw new UsageError(unknown ? `pointfold ${command}: unknown option '${unknown[1]}' (see pointfold ${command} --help)` : `pointfold ${command}: ${msg}`);
  }
}

/** A positive length in Å from an option, at most `max`. @throws UsageError. */
export function lengthOption(command: string, name: string, raw: string | undefined, max: number): number | undefined {
  if (raw == null) return undefined;
  const v = Number(raw);
  if (raw.trim() === '' || !Number.isFinite(v) || v <= 0 || v > max) {
    throw new UsageError(`pointfold ${command}: --${name} must be a length in Å greater than 0 and at most ${max} (got '${raw}')`);
  }
  return v;
}

/** An integer option within [min, max]. @throws UsageError. */
export function integerOption(command: string, name: string, raw: string | undefined, min: number, max: number): number | undefined {
  if (raw == null) return undefined;
  const v = Number(raw);
  if (!/^[+-]?\d+$/.test(raw.trim()) || v < min || v > max) {
    throw new UsageError(`pointfold ${command}: --${name} must be an integer from ${min} to ${max} (got '${raw}')`);
  }
  return v;
}
