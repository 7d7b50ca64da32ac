// The floor `npm run bench` compares each owner page's first-load JavaScript with: a page with nothing on
// it, under the root layout of the same build, so what is left is the page's own share. Only a
// benchmark build has it (the `.bench.ts` page extension, next.config.mjs; tests/bench/server-harness.ts).
export default function BlankPage() {
  return null;
}
