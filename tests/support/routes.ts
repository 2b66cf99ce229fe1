import type { Express } from 'express';

/** One registered route of an Express app: method, full path, and its handler chain. */
export interface RouteEntry {
  method: string;
  path: string;
  handlers: Function[];
}

interface LayerLike {
  rawPath?: string | string[];
  route?: { path: string | string[]; methods: Record<string, boolean>; stack: { handle: Function }[] };
  handle: Function & { stack?: LayerLike[] };
}

const join = (a: string, b: string) => `${a.replace(/\/$/, '')}/${b.replace(/^\//, '')}`.replace(/\/$/, '') || '/';

function walk(stack: LayerLike[], prefix: string, out: RouteEntry[]): void {
  for (const layer of stack) {
    if (layer.route) {
      const paths = Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path];
      for (const p of paths) {
        for (const method of Object.keys(layer.route.methods)) {
          if (method === '_all') continue;
          out.push({ method: method.toUpperCase(), path: join(prefix, p), handlers: layer.route.stack.map((l) => l.handle) });
        }
      }
    } else if (Array.isArray(layer.handle.stack)) {
      // A mounted Router: its own routes under the mount path(s).
      const mounts = Array.isArray(layer.rawPath) ? layer.rawPath : [layer.rawPath ?? '/'];
      for (const mount of mounts) walk(layer.handle.stack, join(prefix, String(mount)), out);
    }
  }
}

/**
 * Every route registered on the app, including routers mounted with `app.use(path, router)`
 * (Express 5 / router 2 keep the mount path as `rawPath`). Plain middleware is not a route.
 */
export function listRoutes(app: Express): RouteEntry[] {
  const out: RouteEntry[] = [];
  walk((app as unknown as { router: { stack: LayerLike[] } }).router.stack, '', out);
  return out;
}
