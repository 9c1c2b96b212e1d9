/**
 * The route table of a built app, read from Express's router stack (not a hand list): every
 * method and path with the access its endpoint names. The permission-map and access-matrix
 * tests walk it, so a route added anywhere is checked without anyone listing it.
 */
import type { Express } from 'express';
import { accessOf, type Access } from './http';

export interface RouteEntry {
  method: string;
  /** Express path with parameters, e.g. /api/lots/:id/status. */
  path: string;
  /** What the route's endpoint names; undefined when no handler was made by endpoint(). */
  access: Access | undefined;
  /** Every access named along the route (upload parser and endpoint must agree). */
  accesses: Access[];
}

interface LayerLike {
  rawPath?: unknown;
  handle?: { stack?: LayerLike[] } & ((...args: never[]) => unknown);
  route?: { path: unknown; methods: Record<string, boolean>; stack: LayerLike[] };
}

function join(prefix: string, part: unknown): string {
  const p = typeof part === 'string' ? part : String(part);
  const joined = `${prefix}/${p}`.replace(/\/+/g, '/');
  return joined.length > 1 ? joined.replace(/\/$/, '') : joined;
}

function walk(stack: LayerLike[], prefix: string, out: RouteEntry[]): void {
  for (const layer of stack) {
    if (layer.route) {
      const path = join(prefix, layer.route.path);
      const accesses = layer.route.stack.map((l) => accessOf(l.handle)).filter((a): a is Access => a !== undefined);
      for (const [method, on] of Object.entries(layer.route.methods)) {
        if (!on || method === '_all') continue;
        out.push({ method: method.toUpperCase(), path, access: accesses[accesses.length - 1], accesses });
      }
    } else if (layer.handle && Array.isArray(layer.handle.stack)) {
      // A mounted router: its rawPath is the mount path ('/' for routers used without one).
      walk(layer.handle.stack, layer.rawPath === undefined || layer.rawPath === '/' ? prefix : join(prefix, layer.rawPath), out);
    }
  }
}

/** Every route the app registers, in registration order. */
export function routeTable(app: Express): RouteEntry[] {
  const router = (app as unknown as { router?: { stack: LayerLike[] } }).router;
  if (!router) throw new Error('The app has no router yet: build it with createApp() first.');
  const out: RouteEntry[] = [];
  walk(router.stack, '', out);
  return out;
}
