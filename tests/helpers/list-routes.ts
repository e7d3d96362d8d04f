import type { Express } from 'express';

/**
 * The routes an Express 5 app has registered, as 'METHOD /path' in the path syntax they were
 * registered with (e.g. 'GET /api/people/:id'). Walks `app.router.stack` and every nested router,
 * joining mount paths, so a router mounted anywhere is still seen.
 *
 * The layer fields read here (`route`, `handle.stack`, `rawPath`) are those of the `router` package
 * that Express 5 uses; `rawPath` is the path a layer was registered with.
 */
interface RouteLike {
  path: string | string[];
  methods: Record<string, boolean>;
}

interface LayerLike {
  route?: RouteLike;
  handle?: { stack?: LayerLike[] };
  rawPath?: unknown;
}

export function listRoutes(app: Express): string[] {
  const found = new Set<string>();
  walk((app as unknown as { router: { stack: LayerLike[] } }).router.stack, '', found);
  return [...found].sort();
}

function walk(stack: LayerLike[], prefix: string, found: Set<string>) {
  for (const layer of stack) {
    if (layer.route) {
      const paths = Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path];
      for (const p of paths) {
        for (const [method, on] of Object.entries(layer.route.methods)) {
          if (on && method !== '_all') found.add(`${method.toUpperCase()} ${join(prefix, p)}`);
        }
      }
    } else if (layer.handle?.stack) {
      const mount = typeof layer.rawPath === 'string' ? layer.rawPath : '';
      walk(layer.handle.stack, join(prefix, mount), found);
    }
  }
}

function join(prefix: string, path: string): string {
  const joined = `${prefix.replace(/\/+$/, '')}/${path.replace(/^\/+/, '')}`;
  return joined.length > 1 ? joined.replace(/\/+$/, '') : joined;
}
