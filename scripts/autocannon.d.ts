// The part of autocannon's API the load benchmark uses (the package ships no types).
declare module 'autocannon' {
  export interface Options {
    url: string
    connections?: number
    duration?: number
    timeout?: number
    method?: string
    headers?: Record<string, string>
    body?: string
    requests?: Array<{ setupRequest?: (req: Record<string, unknown>) => Record<string, unknown> }>
  }
  export interface Histogram {
    average: number
    p50: number
    p99: number
  }
  export interface Result {
    requests: Histogram
    latency: Histogram
    errors: number
    timeouts: number
    non2xx: number
  }
  export default function autocannon(options: Options): Promise<Result>
}
