/**
 * `npm run bench -- read`: how fast the trace reader turns an export into typed arrays, side by side with
 * papaparse alone (default and fast mode), a bare split-and-parseFloat loop and plain UTF-8 decoding, on a
 * 1,000,000-row and a 100,000-row three-column export (time, ramp, transmission) generated in memory.
 * Also the memory the reader holds and the RSS growth while it runs, relative to the file size.
 */
import Papa from 'papaparse'
import { runInNewContext } from 'node:vm'
import { setFlagsFromString } from 'node:v8'
import { readTrace } from '../../shared/trace/readTrace'

setFlagsFromString('--expose-gc')
const gc = runInNewContext('gc') as () => void

/** A swept-cavity-like export: sawtooth ramp and narrow Lorentzian peaks on a baseline, like a scope prints it. */
function makeExport(rows: number): Uint8Array {
  const dt = 1e-7
  const t0 = -0.05
  const period = rows / 5
  const lines: string[] = ['Time (s),Ramp (V),Transmission (V)']
  for (let i = 0; i < rows; i++) {
    const phase = (i % period) / period
    const x = (phase * 4) % 1
    const peak = 1 / (1 + ((x - 0.5) / 0.002) ** 2)
    const light = 0.02 + 3.1 * peak + 0.004 * Math.sin(i * 0.7)
    lines.push(`${(t0 + i * dt).toExponential(7)},${(-1 + 2 * phase).toFixed(5)},${light.toFixed(6)}`)
  }
  return new TextEncoder().encode(lines.join('\r\n') + '\r\n')
}

function splitAndParse(bytes: Uint8Array): Float64Array[] {
  const text = new TextDecoder().decode(bytes)
  const lines = text.split('\n')
  const columns = [new Float64Array(lines.length), new Float64Array(lines.length), new Float64Array(lines.length)]
  let rows = 0
  for (let i = 1; i < lines.length; i++) {
    const cells = lines[i].split(',')
    if (cells.length < 3) continue
    columns[0][rows] = parseFloat(cells[0])
    columns[1][rows] = parseFloat(cells[1])
    columns[2][rows] = parseFloat(cells[2])
    rows++
  }
  return columns
}

interface Timing {
  label: string
  ms: number
}

function time(label: string, repeats: number, run: () => unknown): Timing {
  let best = Infinity
  for (let k = 0; k < repeats; k++) {
    gc()
    const start = performance.now()
    run()
    best = Math.min(best, performance.now() - start)
  }
  return { label, ms: best }
}

function measureMemory(bytes: Uint8Array): { heldMb: number; rssGrowthMb: number } {
  gc()
  const before = process.memoryUsage()
  const trace = readTrace(bytes)
  const after = process.memoryUsage()
  gc()
  const settled = process.memoryUsage()
  const held = settled.heapUsed + settled.arrayBuffers - (before.heapUsed + before.arrayBuffers)
  if (trace.sampleCount === 0) throw new Error('unreachable')
  return { heldMb: held / 2 ** 20, rssGrowthMb: (after.rss - before.rss) / 2 ** 20 }
}

export default async function benchRead(): Promise<void> {
  for (const rows of [1_000_000, 100_000]) {
    const bytes = makeExport(rows)
    const mb = bytes.length / 2 ** 20
    const repeats = rows >= 1_000_000 ? 3 : 7
    const results = [
      time('TextDecoder only (UTF-8 decode)', repeats, () => new TextDecoder().decode(bytes)),
      time('readTrace (typed arrays, roles, axis check)', repeats, () => readTrace(bytes)),
      time('bare split + parseFloat', repeats, () => splitAndParse(bytes)),
      time('papaparse, fastMode: true', repeats, () => Papa.parse(new TextDecoder().decode(bytes), { fastMode: true })),
      time('papaparse, default', repeats, () => Papa.parse(new TextDecoder().decode(bytes))),
    ]
    const memory = measureMemory(bytes)
    console.log(`\n${rows.toLocaleString('en')} rows × 3 columns, ${mb.toFixed(1)} MiB (best of ${repeats})`)
    console.log('| what | ms | MiB/s |')
    console.log('|---|---:|---:|')
    for (const result of results) {
      console.log(`| ${result.label} | ${result.ms.toFixed(0)} | ${(mb / (result.ms / 1000)).toFixed(0)} |`)
    }
    console.log(
      `| readTrace memory: held after ${memory.heldMb.toFixed(1)} MiB (${(memory.heldMb / mb).toFixed(2)}× file), RSS growth during read ${memory.rssGrowthMb.toFixed(1)} MiB (${(memory.rssGrowthMb / mb).toFixed(2)}× file) | | |`,
    )
  }
}
