// autocannon 9 ships no type declarations (there is a @types package, not installed); these cover
// what the reliability suite calls (tests/reliability/load.test.ts). Shapes from its README.
declare module 'autocannon' {
  interface Request {
    method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
    path?: string;
    headers?: Record<string, string>;
    body?: string;
  }
  interface Client {
    setRequests(requests: Request[]): void;
    setHeaders(headers: Record<string, string>): void;
  }
  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    amount?: number;
    timeout?: number;
    headers?: Record<string, string>;
    requests?: Request[];
    setupClient?: (client: Client) => void;
  }
  interface Histogram {
    min: number;
    max: number;
    average: number;
    stddev: number;
    total: number;
    p50: number;
    p90: number;
    p97_5: number;
    p99: number;
    p99_9: number;
  }
  interface Result {
    duration: number;
    connections: number;
    requests: Histogram;
    latency: Histogram;
    throughput: Histogram;
    errors: number;
    timeouts: number;
    non2xx: number;
    statusCodeStats: Record<string, { count: number }>;
  }
  function autocannon(options: Options): Promise<Result>;
  export default autocannon;
}
