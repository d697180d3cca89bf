// Finds things in the handlers of every mounted route, the way server/routes/route-table.ts walks
// Express's router: multipart uploads (singleFile() keeps its settings on the handler) and rate
// limiters (express-rate-limit's middleware carries resetKey()).
import type { Express } from "express";
import type { UploadSpec } from "../../../server/middleware/upload.js";

interface Layer {
  rawPath?: unknown;
  handle: { stack?: Layer[]; upload?: UploadSpec; resetKey?: unknown };
  route?: { path: string; methods: Record<string, boolean>; stack: Layer[] };
}

export interface RouteHandlers {
  /** "POST /api/jobs/:jobId/attachments" */
  key: string;
  handlers: Layer["handle"][];
}

function joinPath(a: string, b: string): string {
  const joined = `${a}/${b}`.replace(/\/+/g, "/");
  return joined.length > 1 ? joined.replace(/\/$/, "") : joined;
}

export function routeHandlers(app: Express): RouteHandlers[] {
  const out: RouteHandlers[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        const path = joinPath(prefix, layer.route.path);
        for (const method of Object.keys(layer.route.methods)) {
          if (method !== "_all") out.push({ key: `${method.toUpperCase()} ${path}`, handlers: layer.route.stack.map((l) => l.handle) });
        }
      } else if (layer.handle.stack && typeof layer.rawPath === "string") {
        walk(layer.handle.stack, joinPath(prefix, layer.rawPath));
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, "");
  return out;
}

/** Every route that reads a multipart file, with what singleFile() was given. */
export function uploadRoutes(app: Express): Array<{ key: string; spec: UploadSpec }> {
  return routeHandlers(app).flatMap(({ key, handlers }) => handlers.filter((h) => h.upload).map((h) => ({ key, spec: h.upload! })));
}

/** Every route with a rate limiter among its handlers. */
export function rateLimitedRoutes(app: Express): string[] {
  return routeHandlers(app)
    .filter(({ handlers }) => handlers.some((h) => typeof h.resetKey === "function"))
    .map(({ key }) => key);
}
