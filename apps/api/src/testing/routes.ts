import type { Express } from 'express';

export type RouteEntry = { method: string; path: string };

type Layer = {
  route?: { path: string; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
};

/** Every route registered on the Express app, as `METHOD /api/path` (the API router is mounted at /api). */
export function expressRoutes(app: Express): RouteEntry[] {
  const out: RouteEntry[] = [];
  const walk = (stack: Layer[], inApi: boolean) => {
    for (const layer of stack) {
      if (layer.route && inApi) {
        for (const method of Object.keys(layer.route.methods)) {
          out.push({ method: method.toUpperCase(), path: `/api${layer.route.path}` });
        }
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack, true);
      }
    }
  };
  // Routes directly on the app (the web app's fall-back) are not part of the API.
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, false);
  return out;
}

/** The `:name` parameters of an Express path. */
export const pathParams = (path: string): string[] => [...path.matchAll(/:(\w+)/g)].map((m) => m[1]);
