import autocannon from 'autocannon'

export interface LoadFigures {
  requestsPerSecond: number
  p50Ms: number
  p95Ms: number
  p99Ms: number
  non2xx: number
  errors: number
  total: number
}

export interface LoadTarget {
  url: string
  connections: number
  durationSeconds: number
  /** Per connection: its own request, and how to change it after each answer. */
  setupClient?: autocannon.Options['setupClient']
  headers?: Record<string, string>
}

/**
 * autocannon's own percentiles are fixed at p2.5/50/97.5/99; p95 is read from its per-request
 * latencies, which it hands to the `response` event of each client.
 */
export async function runLoad(target: LoadTarget): Promise<LoadFigures> {
  const latencies: number[] = []
  const instance = autocannon({
    url: target.url,
    connections: target.connections,
    duration: target.durationSeconds,
    headers: target.headers,
    setupClient: (client) => {
      client.on('response', (_status: number, _bytes: number, responseTimeMs: number) => {
        latencies.push(responseTimeMs)
      })
      target.setupClient?.(client)
    },
  })
  const result = await instance
  latencies.sort((a, b) => a - b)
  const at = (q: number) =>
    latencies[Math.min(latencies.length - 1, Math.floor(q * latencies.length))] ?? NaN
  return {
    requestsPerSecond: result.requests.average,
    p50Ms: at(0.5),
    p95Ms: at(0.95),
    p99Ms: at(0.99),
    non2xx: result.non2xx,
    errors: result.errors + result.timeouts,
    total: latencies.length,
  }
}
