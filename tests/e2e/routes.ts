// Every route handler and server action of the app, read from the file system so that a new one
// cannot be left out of the fuzz and authorization tests.
import fs from "node:fs";
import path from "node:path";

export type RouteFile = { file: string; pattern: string; methods: string[] };

const METHOD = /export\s+(?:const|async\s+function|function)\s+(GET|HEAD|POST|PUT|PATCH|DELETE|OPTIONS)\b/g;

function walk(dir: string, visit: (file: string) => void) {
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name);
    if (entry.isDirectory()) walk(p, visit);
    else visit(p);
  }
}

/** The URL pattern of a file under app/: route groups `(x)` dropped, `[param]` kept. */
function urlPattern(dir: string): string {
  return "/" + path.relative("app", dir).split(path.sep).filter((s) => s && !/^\(.*\)$/.test(s)).join("/");
}

/** Every route.ts under `root` (all of app/ by default) with the HTTP methods it exports. */
export function appRoutes(root = "app"): RouteFile[] {
  const out: RouteFile[] = [];
  walk(root, (p) => {
    if (path.basename(p) !== "route.ts") return;
    const src = fs.readFileSync(p, "utf8");
    const methods = [...new Set([...src.matchAll(METHOD)].map((m) => m[1]!))];
    out.push({ file: p, pattern: urlPattern(path.dirname(p)), methods });
  });
  return out.sort((a, b) => a.pattern.localeCompare(b.pattern));
}

/** The JSON API: route handlers under app/api. */
export function apiRoutes(root = "app/api"): RouteFile[] {
  return appRoutes(root);
}

/** Fills [param] segments. */
export function fill(pattern: string, values: Record<string, string> | ((name: string) => string)): string {
  return pattern.replace(/\[([^\]]+)\]/g, (_, name: string) => encodeURIComponent(typeof values === "function" ? values(name) : (values[name] ?? "missing")));
}

export type ServerActionExport = { file: string; name: string };

// `export async function x(` or `export const x = ...` (action() wrappers, lib/http/action.ts).
const ACTION_EXPORT = /^export\s+(?:async\s+function\s+([A-Za-z_$][\w$]*)|const\s+([A-Za-z_$][\w$]*)\s*=)/gm;

/** The exports of every module under app/ that starts with the "use server" directive. */
export function serverActions(root = "app"): ServerActionExport[] {
  const out: ServerActionExport[] = [];
  walk(root, (p) => {
    if (!/\.(ts|tsx)$/.test(p)) return;
    const src = fs.readFileSync(p, "utf8");
    const firstStatement = src.replace(/^(\s|\/\/[^\n]*\n|\/\*[\s\S]*?\*\/)*/, "");
    if (!/^["']use server["']/.test(firstStatement)) return;
    for (const m of src.matchAll(ACTION_EXPORT)) out.push({ file: p.split(path.sep).join("/"), name: (m[1] ?? m[2])! });
  });
  return out.sort((a, b) => `${a.file}#${a.name}`.localeCompare(`${b.file}#${b.name}`));
}

export type ManifestAction = { id: string; file: string; name: string; pages: string[] };

/**
 * The server actions of the production build (`next build` writes their ids, file and export name to
 * .next/server/server-reference-manifest.json), with the app pages ("app/studio/team/page") that carry each.
 */
export function manifestActions(file = ".next/server/server-reference-manifest.json"): ManifestAction[] {
  const manifest = JSON.parse(fs.readFileSync(file, "utf8")) as {
    node: Record<string, { workers: Record<string, unknown>; filename?: string; exportedName?: string }>;
  };
  return Object.entries(manifest.node).map(([id, v]) => ({ id, file: v.filename ?? "?", name: v.exportedName ?? "?", pages: Object.keys(v.workers) }));
}

/** "app/(owner)/pieces/[id]/transfer/page" → "/pieces/[id]/transfer". */
export function pagePattern(worker: string): string {
  return urlPattern(path.dirname(worker.replace(/\//g, path.sep)));
}
