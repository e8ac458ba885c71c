import type { Express } from 'express';

export interface RouteEntry {
  /** "METHOD /path/:param", as keyed in docs/access-matrix.json. */
  key: string;
  method: string;
  path: string;
  /** The first handler's allow(...) audience, or null when the route does not start with allow(). */
  access: readonly string[] | null;
}

interface Layer {
  rawPath?: unknown;
  route?: { path: string | string[]; methods: Record<string, boolean>; stack: { handle: { access?: readonly string[] } }[] };
  handle: { stack?: Layer[] };
}

const join = (a: string, b: string) => `${a}/${b}`.replace(/\/+/g, '/').replace(/(.)\/$/, '$1');

/** Every route of the Express 5 app, found by walking the router stack (nested routers included). */
export function listRoutes(app: Express): RouteEntry[] {
  const out: RouteEntry[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        const paths = Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path];
        for (const p of paths) {
          for (const method of Object.keys(layer.route.methods).filter((m) => layer.route!.methods[m] && m !== '_all')) {
            const path = join(prefix, p);
            const first = layer.route.stack[0]?.handle;
            out.push({ key: `${method.toUpperCase()} ${path}`, method: method.toUpperCase(), path, access: first?.access ?? null });
          }
        }
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack, typeof layer.rawPath === 'string' ? join(prefix, layer.rawPath) : prefix);
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '');
  return out;
}
