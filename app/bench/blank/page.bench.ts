// A page with nothing on it, under the root layout of the same build: the floor `npm run bench` compares
// each owner page's first-load JavaScript with (what is left is the page's own share), and whose p95 it
// reports beside the owner piece page's (what any page of this build costs before its content). Rendered
// for each request like the owner pages, not prerendered once: a prerendered page is a file served from
// the cache, which would say nothing about rendering. Only a benchmark build has it (the `.bench.ts` page
// extension, next.config.mjs; tests/bench/server-harness.ts).
export const dynamic = "force-dynamic";

export default function BlankPage() {
  return null;
}
