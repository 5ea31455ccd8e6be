// The part of autocannon's API the HTTP benchmark uses (the package ships no types).
declare module "autocannon" {
  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    headers?: Record<string, string>;
  }
  interface Histogram {
    average: number;
    p50: number;
    p99: number;
  }
  interface Result {
    requests: Histogram & { total: number };
    latency: Histogram;
    errors: number;
    timeouts: number;
    non2xx: number;
  }
  function autocannon(options: Options, done: (error: Error | null, result: Result) => void): unknown;
  export default autocannon;
}
