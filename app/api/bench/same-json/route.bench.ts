import fs from "node:fs";
import { NextResponse } from "next/server";

// The floor `npm run bench` compares GET /api/pieces with: a route handler that does no session check
// and no query, and serializes the same JSON body (read once from GRAINWARD_BENCH_JSON). Only a
// benchmark build has it: the `.bench.ts` name is a page extension only when GRAINWARD_BENCH_BUILD=1
// (next.config.mjs, set by tests/bench/server-harness.ts); `next build` for the product leaves it out.
export const dynamic = "force-dynamic";

let body: unknown;

export function GET() {
  const file = process.env.GRAINWARD_BENCH_JSON;
  if (!file) return NextResponse.json({ error: { code: "not_found", message: "Not found." } }, { status: 404 });
  body ??= JSON.parse(fs.readFileSync(file, "utf8"));
  return NextResponse.json(body);
}
