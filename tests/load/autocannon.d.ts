// The parts of autocannon's API the load bench uses (the package ships no types).
declare module "autocannon" {
  interface RequestSpec {
    setupRequest?: (req: { path?: string; method?: string; headers?: Record<string, string> }) => { path?: string; method?: string; headers?: Record<string, string> };
  }
  interface Options {
    url: string;
    connections?: number;
    overallRate?: number;
    duration?: number;
    amount?: number;
    headers?: Record<string, string>;
    requests?: RequestSpec[];
  }
  interface Result {
    requests: { average: number; total: number };
    latency: { p50: number; p99: number; max: number };
    non2xx: number;
    errors: number;
  }
  interface Instance extends PromiseLike<Result> {
    on(event: "response", listener: (client: unknown, statusCode: number, resBytes: number, responseTimeMs: number) => void): this;
  }
  function autocannon(options: Options): Instance;
  export default autocannon;
}
