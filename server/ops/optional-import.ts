import { existsSync } from 'node:fs';
import { relative } from 'node:path';
import { fileURLToPath } from 'node:url';

const repoRootDir = fileURLToPath(new URL('../..', import.meta.url));

/**
 * Imports a module that another part of the system provides, by URL so the type check does not
 * require it to exist yet; null (with a warning) when the file is absent. Any import error of
 * a file that exists (a syntax error in it, say) is real and propagates.
 */
export async function importOptional<T>(url: URL, exportName: string, warn: (line: string) => void): Promise<T | null> {
  const shown = relative(repoRootDir, fileURLToPath(url));
  if (!existsSync(fileURLToPath(url))) {
    warn(`${shown} is not there yet; skipping ${exportName}`);
    return null;
  }
  const mod = (await import(url.href)) as Record<string, unknown>;
  if (typeof mod[exportName] !== 'function') {
    warn(`${shown} has no export ${exportName}; skipping it`);
    return null;
  }
  return mod[exportName] as T;
}

