// Minimal types for the parts of autocannon the benchmarks use (the package ships none).
declare module "autocannon" {
  interface Histogram {
    average: number;
    mean: number;
    stddev: number;
    min: number;
    max: number;
    p50: number;
    p90: number;
    p99: number;
  }
  interface Options {
    url: string;
    method?: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
    headers?: Record<string, string>;
    body?: string | Buffer;
    connections?: number;
    duration?: number;
    pipelining?: number;
    timeout?: number;
    /** Each connection sends these in turn, round and round. */
    requests?: { method?: "GET" | "POST" | "PUT" | "PATCH" | "DELETE"; path?: string; headers?: Record<string, string>; body?: string }[];
    /** Run the load generator in this many worker threads instead of the calling thread. */
    workers?: number;
  }
  interface Result {
    requests: Histogram;
    latency: Histogram;
    duration: number;
    errors: number;
    timeouts: number;
    non2xx: number;
    statusCodeStats?: Record<string, { count: number }>;
  }
  function autocannon(options: Options): Promise<Result>;
  export default autocannon;
}
