// One measured figure of a benchmark, printed as a RESULT line that tests/bench/run.ts turns into a row
// of REPORT.md. A figure that misses its target makes the benchmark exit non-zero.
export type BenchResult = { figure: string; target: string; measured: string; floor: string; ratio: number | null; ok: boolean };

export function result(r: BenchResult): void {
  console.log(`${r.ok ? "✓" : "✗"} ${r.figure}: ${r.measured} (target ${r.target}; floor ${r.floor})`);
  console.log(`RESULT ${JSON.stringify(r)}`);
  if (!r.ok) process.exitCode = 1;
}
