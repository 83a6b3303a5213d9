/**
 * `npm run bench -- read`: how fast the trace reader turns an export into typed arrays, side by side with
 * papaparse alone (default and fast mode), a bare split-and-parseFloat loop and plain UTF-8 decoding, on a
 * 1,000,000-row and a 100,000-row three-column export (time, ramp, transmission) generated in memory.
 * Also the memory the reader holds and the RSS growth while it runs, relative to the file size.
 */
import Papa from 'papaparse'
import { spawnSync } from 'node:child_process'
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { cpus, loadavg, tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
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
  /** Best wall-clock time over the repeats. */
  ms: number
  /** Best CPU time (user + system) of this process over the repeats: steadier on a shared, busy machine. */
  cpuMs: number
}

function time(label: string, repeats: number, run: () => unknown): Timing {
  let best = Infinity
  let bestCpu = Infinity
  run() // warm-up: compiled code, not the first-call cost, is what a busy server runs
  for (let k = 0; k < repeats; k++) {
    gc()
    const cpu = process.cpuUsage()
    const start = performance.now()
    run()
    best = Math.min(best, performance.now() - start)
    const used = process.cpuUsage(cpu)
    bestCpu = Math.min(bestCpu, (used.user + used.system) / 1000)
  }
  return { label, ms: best, cpuMs: bestCpu }
}

/**
 * Peak memory of one read, measured in a fresh process so the generator's garbage does not count: the file is
 * loaded, then the high-water RSS (getrusage maxrss) is compared before and after readTrace.
 */
function measurePeakMemory(bytes: Uint8Array): { peakGrowthMb: number; heldMb: number } {
  const folder = mkdtempSync(join(tmpdir(), 'cavitrace-bench-'))
  try {
    const file = join(folder, 'export.csv')
    writeFileSync(file, bytes)
    const child = spawnSync(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url), '--measure-memory', file], {
      encoding: 'utf8',
    })
    return JSON.parse(child.stdout) as { peakGrowthMb: number; heldMb: number }
  } finally {
    rmSync(folder, { recursive: true, force: true })
  }
}

function measureMemoryHere(file: string): void {
  const bytes = readFileSync(file)
  gc()
  const before = process.memoryUsage()
  const trace = readTrace(bytes)
  const peakAfter = process.resourceUsage().maxRSS * 1024
  gc()
  const after = process.memoryUsage()
  const held = after.heapUsed + after.arrayBuffers - (before.heapUsed + before.arrayBuffers)
  // High-water mark minus the RSS before the read: an upper bound on what the read itself needed.
  const peakGrowth = Math.max(0, peakAfter - before.rss)
  process.stdout.write(JSON.stringify({ peakGrowthMb: peakGrowth / 2 ** 20, heldMb: held / 2 ** 20, n: trace.sampleCount }))
}

export default async function benchRead(): Promise<void> {
  for (const rows of [100_000, 1_000_000]) {
    const bytes = makeExport(rows)
    const mb = bytes.length / 2 ** 20
    const repeats = rows >= 1_000_000 ? 3 : 15
    const results = [
      time('TextDecoder only (UTF-8 decode)', repeats, () => new TextDecoder().decode(bytes)),
      time('readTrace (typed arrays, roles, axis check)', repeats, () => readTrace(bytes)),
      time('bare split + parseFloat', repeats, () => splitAndParse(bytes)),
      time('papaparse, fastMode: true', repeats, () => Papa.parse(new TextDecoder().decode(bytes), { fastMode: true })),
      time('papaparse, default', repeats, () => Papa.parse(new TextDecoder().decode(bytes))),
    ]
    const memory = measurePeakMemory(bytes)
    console.log(`\n${rows.toLocaleString('en')} rows × 3 columns, ${mb.toFixed(1)} MiB (best of ${repeats}; load average ${loadavg()[0].toFixed(1)} on ${cpus().length} CPUs)`)
    console.log('| what | wall ms | CPU ms | MiB/s (wall) |')
    console.log('|---|---:|---:|---:|')
    for (const result of results) {
      console.log(
        `| ${result.label} | ${result.ms.toFixed(0)} | ${result.cpuMs.toFixed(0)} | ${(mb / (result.ms / 1000)).toFixed(0)} |`,
      )
    }
    console.log(
      `readTrace memory (fresh process, file already loaded): peak RSS growth at most ${memory.peakGrowthMb.toFixed(1)} MiB ` +
        `= ${(memory.peakGrowthMb / mb).toFixed(2)}× the file; held by the result ${memory.heldMb.toFixed(1)} MiB ` +
        `= ${(memory.heldMb / mb).toFixed(2)}× the file`,
    )
  }
}

if (process.argv[2] === '--measure-memory') measureMemoryHere(process.argv[3])
