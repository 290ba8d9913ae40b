import type { Router } from 'express';

export type RouteInfo = { method: string; path: string };

/** Lists the routes of mounted routers, so the role-matrix test can prove it covers every one. */
export function listRoutes(mounts: Array<[string, Router]>): RouteInfo[] {
  const out: RouteInfo[] = [];
  for (const [prefix, router] of mounts) {
    for (const layer of router.stack as Array<{ route?: { path: string; methods: Record<string, boolean> } }>) {
      if (!layer.route) continue;
      for (const method of Object.keys(layer.route.methods)) {
        if (method === '_all') continue;
        out.push({ method: method.toUpperCase(), path: `${prefix}${layer.route.path === '/' ? '' : layer.route.path}` });
      }
    }
  }
  return out;
}
