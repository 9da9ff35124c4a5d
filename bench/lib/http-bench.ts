// An HTTP load benchmark with autocannon: N concurrent clients for a fixed time, several runs,
// the median of each figure. Non-2xx answers are counted and reported, never hidden.
import autocannon from "autocannon";
import { median, percentile, round } from "./stats";

export interface HttpFigures {
  p50: number;
  p95: number;
  p99: number;
  requestsPerSecond: number;
  non2xx: number;
  errors: number;
}

export async function benchHttp(options: { url: string; headers?: Record<string, string>; connections?: number; seconds?: number; runs?: number; method?: "GET" | "POST"; body?: string; requests?: autocannon.Request[] }): Promise<HttpFigures> {
  const runs: HttpFigures[] = [];
  for (let i = 0; i < (options.runs ?? 3); i++) {
    // Every response time is kept, so p95 is read exactly (autocannon's summary stops at p90 and p97.5).
    const latencies: number[] = [];
    const result = await new Promise<autocannon.Result>((resolve, reject) => {
      const instance = autocannon(
        {
          url: options.url,
          connections: options.connections ?? 32,
          duration: options.seconds ?? 8,
          headers: options.headers,
          method: options.method ?? "GET",
          body: options.body,
          requests: options.requests,
        },
        (error, done) => (error ? reject(error) : resolve(done)),
      );
      instance.on("response", (_client, _status, _bytes, responseTime) => latencies.push(responseTime));
    });
    runs.push({
      p50: percentile(latencies, 50),
      p95: percentile(latencies, 95),
      p99: percentile(latencies, 99),
      requestsPerSecond: result.requests.average,
      non2xx: result.non2xx,
      errors: result.errors,
    });
  }
  return {
    p50: round(median(runs.map((r) => r.p50))),
    p95: round(median(runs.map((r) => r.p95))),
    p99: round(median(runs.map((r) => r.p99))),
    requestsPerSecond: round(median(runs.map((r) => r.requestsPerSecond))),
    non2xx: runs.reduce((s, r) => s + r.non2xx, 0),
    errors: runs.reduce((s, r) => s + r.errors, 0),
  };
}
