import type { RequestHandler, Router } from 'express';
import type { z } from 'zod';

import type { Action, Role } from '@/telemetry/roles';

/**
 * What a route says about itself, carried on its middleware: the role check
 * (`allow`), the request schemas (`validate`) and a summary with the response
 * schema (`doc`). The OpenAPI document is read off the mounted router, so a route
 * cannot be served and left out of it.
 */
export type RouteMeta = {
  access?: Action | 'signed-in' | 'public';
  /** roles narrowed further than `access` says (a view-only sign-in refused, say) */
  roles?: readonly Role[];
  params?: z.ZodType;
  query?: z.ZodType;
  body?: z.ZodType;
  summary?: string;
  response?: z.ZodType;
  status?: number;
  contentType?: string;
  upload?: string;
};
const metaKey = Symbol.for('thawline.route-meta');

export function tagged<T extends RequestHandler>(fn: T, meta: RouteMeta): T {
  (fn as unknown as Record<symbol, RouteMeta>)[metaKey] = {
    ...((fn as unknown as Record<symbol, RouteMeta>)[metaKey] ?? {}),
    ...meta,
  };
  return fn;
}
const metaOf = (fn: unknown): RouteMeta | undefined => (fn as Record<symbol, RouteMeta> | undefined)?.[metaKey];

/** A route's summary for people reading the API, and the shape of what it answers. */
export function doc(
  summary: string,
  more: Omit<RouteMeta, 'summary' | 'access' | 'params' | 'query' | 'body'> = {},
): RequestHandler {
  return tagged((_req, _res, next) => next(), { summary, ...more });
}

export type MountedRoute = { method: string; path: string; meta: RouteMeta };

type Layer = {
  route?: { path: string; methods: Record<string, boolean>; stack: { handle: unknown }[] };
  handle: unknown & { stack?: Layer[] };
  rawPath?: unknown;
};

/** Every route mounted under a router, with the path Express matches and what its middleware says. */
export function mountedRoutes(router: Router, prefix = ''): MountedRoute[] {
  const out: MountedRoute[] = [];
  for (const layer of (router as unknown as { stack: Layer[] }).stack) {
    if (layer.route) {
      const meta: RouteMeta = {};
      for (const h of layer.route.stack) Object.assign(meta, metaOf(h.handle) ?? {});
      for (const method of Object.keys(layer.route.methods).filter((m) => layer.route!.methods[m] && m !== '_all')) {
        out.push({ method, path: prefix + (layer.route.path === '/' ? '' : layer.route.path) || '/', meta });
      }
    } else if (layer.handle.stack && typeof layer.rawPath === 'string') {
      out.push(
        ...mountedRoutes(layer.handle as unknown as Router, prefix + (layer.rawPath === '/' ? '' : layer.rawPath)),
      );
    }
  }
  return out;
}
