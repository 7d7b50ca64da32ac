// Every route handler of the app, read from the file system so that a new route cannot be left out
// of the fuzz and authorization tests.
import fs from "node:fs";
import path from "node:path";

export type RouteFile = { file: string; pattern: string; methods: string[] };

const METHOD = /export\s+(?:const|async\s+function|function)\s+(GET|POST|PUT|PATCH|DELETE)\b/g;

export function apiRoutes(root = "app/api"): RouteFile[] {
  const out: RouteFile[] = [];
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(p);
      else if (entry.name === "route.ts") {
        const src = fs.readFileSync(p, "utf8");
        const methods = [...src.matchAll(METHOD)].map((m) => m[1]!);
        const pattern = "/" + path.relative("app", path.dirname(p)).split(path.sep).filter((s) => !/^\(.*\)$/.test(s)).join("/");
        out.push({ file: p, pattern, methods });
      }
    }
  };
  walk(root);
  return out.sort((a, b) => a.pattern.localeCompare(b.pattern));
}

/** Fills [param] segments. */
export function fill(pattern: string, values: Record<string, string> | ((name: string) => string)): string {
  return pattern.replace(/\[([^\]]+)\]/g, (_, name: string) => encodeURIComponent(typeof values === "function" ? values(name) : (values[name] ?? "missing")));
}
