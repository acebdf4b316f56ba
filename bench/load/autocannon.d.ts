/** The part of autocannon's API the load benchmark uses (the package ships no types). */
declare module 'autocannon' {
  export interface RequestSpec {
    method?: string;
    path?: string;
    headers?: Record<string, string>;
    body?: string;
    setupRequest?: (request: RequestSpec, context: Record<string, unknown>) => RequestSpec;
    onResponse?: (status: number, body: string, context: Record<string, unknown>) => void;
  }
  export interface Options {
    url: string;
    connections?: number;
    duration?: number;
    overallRate?: number;
    headers?: Record<string, string>;
    requests?: RequestSpec[];
  }
  export interface Result {
    requests: { average: number; total: number };
    latency: { p50: number; p99: number };
    non2xx: number;
    errors: number;
    timeouts: number;
    duration: number;
  }
  export interface Instance extends PromiseLike<Result> {
    on(
      event: 'response',
      listener: (client: unknown, status: number, bytes: number, ms: number) => void,
    ): void;
  }
  function autocannon(options: Options): Instance;
  export default autocannon;
}
