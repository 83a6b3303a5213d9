/**
 * Analysis timing: read + analyse a two-channel CSV made in memory, and analyse alone, for 100,000 and
 * 1,000,000 samples; peak resident memory against the file size.
 */
import { analyzeTrace } from '../../shared/analysis/analyzeTrace'
import { generateSweptTrace, simPresets } from '../../shared/sim'
import { readTrace } from '../../shared/trace/readTrace'

function csvOf(t: Float64Array, a: Float64Array, b: Float64Array): Uint8Array {
  const lines = ['time,transmission,ramp']
  for (let i = 0; i < t.length; i++) lines.push(`${t[i].toExponential(7)},${a[i].toExponential(5)},${b[i].toExponential(5)}`)
  return new TextEncoder().encode(lines.join('\n'))
}

export default async function bench(): Promise<void> {
  const preset = simPresets['reference-1064']
  const cavity = preset.cavity!
  console.log('| samples | file MB | read ms | analyse ms | read + analyse ms | peak RSS MB | RSS / file |')
  console.log('|---|---|---|---|---|---|---|')
  for (const sampleCount of [100_000, 1_000_000]) {
    const sim = generateSweptTrace({ ...preset, sampleCount, sampleIntervalSeconds: 1e-6 * (200_000 / sampleCount) * 5 })
    const bytes = csvOf(sim.tSeconds, sim.transmissionV, sim.rampV!)
    const rssBefore = process.memoryUsage().rss
    let peak = rssBefore
    const watch = setInterval(() => { peak = Math.max(peak, process.memoryUsage().rss) }, 5)
    const reads: number[] = []
    const analyses: number[] = []
    for (let run = 0; run < 3; run++) {
      const t0 = performance.now()
      const trace = readTrace(bytes)
      const t1 = performance.now()
      analyzeTrace(trace, cavity)
      const t2 = performance.now()
      peak = Math.max(peak, process.memoryUsage().rss)
      reads.push(t1 - t0)
      analyses.push(t2 - t1)
    }
    clearInterval(watch)
    const read = Math.min(...reads)
    const analyse = Math.min(...analyses)
    const mb = bytes.length / 1e6
    console.log(`| ${sampleCount} | ${mb.toFixed(1)} | ${read.toFixed(0)} | ${analyse.toFixed(0)} | ${(read + analyse).toFixed(0)} | ${(peak / 1e6).toFixed(0)} | ${(peak / bytes.length).toFixed(1)} |`)
  }
}
