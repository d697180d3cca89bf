import type { Express } from "express";
import type { Permission } from "../../shared/permissions.js";

export interface RouteEntry {
  method: string;
  /** Full path, e.g. /api/members/:userId */
  path: string;
  /** Names of the path's parameters (":userId" → "userId"). */
  params: string[];
  access: "public" | "session" | "unguarded";
  permission?: Permission;
}

interface Layer {
  rawPath?: unknown;
  handle: { stack?: Layer[]; permission?: Permission; access?: "public" | "session" };
  route?: { path: string; methods: Record<string, boolean>; stack: Layer[] };
}

/**
 * Every route registered on the app, read from Express's own router, with the
 * guard that protects it. Tests walk this list, so a new route is covered the
 * moment it is mounted.
 */
export function listRoutes(app: Express): RouteEntry[] {
  const entries: RouteEntry[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        const path = joinPath(prefix, layer.route.path);
        const guard = layer.route.stack.map((l) => l.handle).find((h) => h.access);
        for (const method of Object.keys(layer.route.methods)) {
          if (method === "_all") continue;
          entries.push({
            method: method.toUpperCase(),
            path,
            params: [...path.matchAll(/:(\w+)/g)].map((m) => m[1]),
            access: guard?.access ?? "unguarded",
            permission: guard?.permission,
          });
        }
      } else if (layer.handle.stack && typeof layer.rawPath === "string") {
        walk(layer.handle.stack, joinPath(prefix, layer.rawPath));
      }
    }
  };
  const router = (app as unknown as { router: { stack: Layer[] } }).router;
  walk(router.stack, "");
  return entries;
}

function joinPath(a: string, b: string): string {
  const joined = `${a}/${b}`.replace(/\/+/g, "/");
  return joined.length > 1 ? joined.replace(/\/$/, "") : joined;
}
