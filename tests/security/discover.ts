// Finds every route handler (app/**/route.ts, by exported HTTP method) and every server action
// (every exported function of app/**/actions.ts) by importing the modules.
import { readFileSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { actionKey, routeKey } from "./routes";

const ROOT = process.cwd();
const HTTP_METHODS = ["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"] as const;

function walk(dir: string, name: string): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(dir)) {
    const full = path.join(dir, entry);
    if (statSync(full).isDirectory()) out.push(...walk(full, name));
    else if (entry === name) out.push(full);
  }
  return out;
}

/** /api/v1/joints/[id] for app/api/v1/joints/[id]/route.ts (route groups and private folders dropped). */
function urlPathOf(file: string): string {
  const segments = path.relative(path.join(ROOT, "app"), path.dirname(file)).split(path.sep).filter((s) => s && !/^\(.*\)$/.test(s));
  return "/" + segments.join("/");
}

export type Discovered = { routes: Map<string, { file: string; handler: (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response> }>; actions: Map<string, (input?: unknown) => Promise<unknown>> };

export async function discover(): Promise<Discovered> {
  const routes: Discovered["routes"] = new Map();
  // Private folders (_name) are not routable in the App Router. A route answered at build time
  // (force-static, no other params) never runs for a request: there is no caller to check.
  const builtAtBuildTime = (f: string) => /export const dynamic = "force-static"/.test(readFileSync(f, "utf8")) && /export const dynamicParams = false/.test(readFileSync(f, "utf8"));
  for (const file of walk(path.join(ROOT, "app"), "route.ts").filter((f) => !path.relative(ROOT, f).split(path.sep).some((s) => s.startsWith("_")) && !builtAtBuildTime(f))) {
    const mod = (await import(file)) as Record<string, unknown>;
    for (const method of HTTP_METHODS) {
      if (typeof mod[method] === "function") routes.set(routeKey({ method, path: urlPathOf(file) }), { file, handler: mod[method] as never });
    }
  }
  const actions: Discovered["actions"] = new Map();
  for (const file of walk(path.join(ROOT, "app"), "actions.ts")) {
    const mod = (await import(file)) as Record<string, unknown>;
    // In a "use server" file every exported function is callable from a browser: all count.
    for (const [name, value] of Object.entries(mod)) {
      if (typeof value === "function") actions.set(actionKey({ file: path.relative(ROOT, file).split(path.sep).join("/"), name }), value as never);
    }
  }
  return { routes, actions };
}

