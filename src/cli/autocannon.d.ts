// The parts of autocannon's API the benchmark uses (the package ships no types).
declare module 'autocannon' {
  namespace autocannon {
    interface Request {
      method?: string;
      path?: string;
      headers?: Record<string, string>;
      body?: string;
      setupRequest?: (req: Request, context: Record<string, unknown>) => Request;
      onResponse?: (status: number, body: string, context: Record<string, unknown>, headers: Record<string, string>) => void;
    }
    interface Options {
      url: string;
      connections?: number;
      duration?: number;
      headers?: Record<string, string>;
      requests?: Request[];
    }
    interface Histogram {
      average: number;
      p50: number;
      p99: number;
    }
    interface Result {
      requests: Histogram;
      latency: Histogram;
      '2xx': number;
      non2xx: number;
      errors: number;
      timeouts: number;
      /** Answers by status code ("201", "409", …). */
      statusCodeStats?: Record<string, { count: number }>;
    }
  }
  function autocannon(opts: autocannon.Options): Promise<autocannon.Result>;
  export default autocannon;
}
