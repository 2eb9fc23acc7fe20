// Times the measurement engine on the full lumbar fixture (L1–L5 corners, S1 with the posterior
// wall point, both femoral heads): median and p95 per call, without and with uncertainty.
// Figures only, no assertions: a benchmark that fails on a slow machine tells nobody anything.
import { readFile } from 'node:fs/promises'
import { performance } from 'node:perf_hooks'
import { computeMeasurements, computeUncertainty } from '@shared/measurement/index'
import type { LandmarkDocument } from '@shared/types/landmarks'

const FIXTURE = new URL('../../tests/fixtures/landmarks/lumbar-alignment.json', import.meta.url)

interface Timing {
  medianMs: number
  p95Ms: number
  samples: number
}

function quantile(sorted: readonly number[], q: number): number {
  const index = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))
  return sorted[index] as number
}

// Fast calls are timed in batches, because one call is close to the timer's resolution; each
// batch gives one per-call sample.
function time(call: () => unknown, batchSize: number, batches: number): Timing {
  for (let i = 0; i < batchSize * 10; i += 1) call()
  const samples: number[] = []
  for (let b = 0; b < batches; b += 1) {
    const start = performance.now()
    for (let i = 0; i < batchSize; i += 1) call()
    samples.push((performance.now() - start) / batchSize)
  }
  samples.sort((a, b) => a - b)
  return { medianMs: quantile(samples, 0.5), p95Ms: quantile(samples, 0.95), samples: batches }
}

function report(label: string, timing: Timing, targetMs: number): void {
  const verdict = timing.medianMs < targetMs ? 'within' : 'OVER'
  console.log(
    `${label}: median ${timing.medianMs.toFixed(4)} ms, p95 ${timing.p95Ms.toFixed(4)} ms per call ` +
      `(${timing.samples} samples; target < ${targetMs} ms: ${verdict})`,
  )
}

export async function run(): Promise<void> {
  const doc = JSON.parse(await readFile(FIXTURE, 'utf8')) as LandmarkDocument
  console.log(`fixture: ${Object.keys(doc.points).length} landmarks, calibrated`)
  report(
    'computeMeasurements',
    time(() => computeMeasurements(doc), 200, 200),
    0.2,
  )
  report(
    'computeUncertainty',
    time(() => computeUncertainty(doc), 1, 300),
    10,
  )
}
