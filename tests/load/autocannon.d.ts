// The part of autocannon 9's API the load harness uses (the package ships no types; @types/autocannon is not installed).
declare module 'autocannon' {
  namespace autocannon {
    interface Request {
      method?: string;
      path?: string;
      body?: string;
      headers?: Record<string, string>;
      setupRequest?: (req: Request, context: Record<string, unknown>) => Request;
      onResponse?: (status: number, body: string, context: Record<string, unknown>, headers: Record<string, string>) => void;
    }
    interface Options {
      url: string;
      connections?: number;
      duration?: number;
      timeout?: number;
      headers?: Record<string, string>;
      requests?: Request[];
      setupClient?: (client: { setHeaders(h: Record<string, string>): void; setRequests(r: Request[]): void }) => void;
    }
    interface Histogram { average: number; mean: number; total: number; p50: number; p90: number; p99: number; max: number }
    interface Result {
      connections: number;
      duration: number;
      requests: Histogram;
      latency: Histogram;
      non2xx: number;
      errors: number;
      timeouts: number;
    }
  }
  function autocannon(opts: autocannon.Options, cb: (err: Error | null, result: autocannon.Result) => void): unknown;
  export default autocannon;
}
