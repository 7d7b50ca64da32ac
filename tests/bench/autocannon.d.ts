// Minimal types for the parts of autocannon 9 the benchmarks use (the package ships none).
declare module "autocannon" {
  type Options = { url: string; connections?: number; duration?: number; headers?: Record<string, string> };
  type Result = { non2xx: number; errors: number; timeouts: number; requests: { total: number } };
  type Instance = Promise<Result> & { on(event: "response", fn: (client: unknown, status: number, bytes: number, ms: number) => void): void };
  function autocannon(opts: Options): Instance;
  export default autocannon;
}
