/**
 * `npm run bench -- analysis`: read + analyse a two-channel CSV export (time, transmission, ramp) of 100,000 and
 * 1,000,000 samples, and analyse alone. Each size runs in a fresh process with the file already loaded, so the
 * generator's arrays do not count: the first analysis there is cold (the JavaScript engine has not compiled the
 * hot loops yet), later ones are warm (a worker that has analysed a trace before). Wall time sits beside CPU time
 * because the machine may be shared. Peak memory is the high-water RSS growth during read + analyse against the
 * file size (the file's own bytes are already resident before and not counted).
 */
import { spawnSync } from 'node:child_process'
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { runInNewContext } from 'node:vm'
import { setFlagsFromString } from 'node:v8'
import { analyzeTrace } from '../../shared/analysis/analyzeTrace'
import { generateSweptTrace, simPresets } from '../../shared/sim'
import { readTrace } from '../../shared/trace/readTrace'

const preset = simPresets['reference-1064']
const RUNS = 4

function csvOf(t: Float64Array, a: Float64Array, b: Float64Array): Uint8Array {
  const lines = ['time,transmission,ramp']
  for (let i = 0; i < t.length; i++) lines.push(`${t[i].toExponential(7)},${a[i].toExponential(5)},${b[i].toExponential(5)}`)
  return new TextEncoder().encode(lines.join('\n'))
}

interface Run {
  readMs: number
  analyseMs: number
  readCpuMs: number
  analyseCpuMs: number
}

interface ChildReport {
  runs: Run[]
  peakGrowthMb: number
  fileMb: number
}

/** Runs in the fresh process: the file is loaded first, then read + analysed RUNS times. */
function measureHere(file: string): void {
  setFlagsFromString('--expose-gc')
  const gc = runInNewContext('gc') as () => void
  const bytes: Uint8Array = readFileSync(file)
  gc()
  // Reset the kernel's high-water mark (Linux: writing 5 to clear_refs), so module loading does not count.
  const resetPeak = () => {
    try {
      writeFileSync('/proc/self/clear_refs', '5')
      return true
    } catch {
      return false
    }
  }
  const peakRss = (reset: boolean) => {
    if (reset) {
      const m = /VmHWM:\s+(\d+) kB/.exec(readFileSync('/proc/self/status', 'utf8'))
      if (m) return Number(m[1]) * 1024
    }
    return process.resourceUsage().maxRSS * 1024
  }
  const reset = resetPeak()
  const rssBefore = process.memoryUsage().rss
  const runs: Run[] = []
  let peakGrowth = 0
  for (let run = 0; run < RUNS; run++) {
    const c0 = process.cpuUsage()
    const t0 = performance.now()
    const trace = readTrace(bytes)
    const t1 = performance.now()
    const c1 = process.cpuUsage()
    analyzeTrace(trace, preset.cavity!)
    const t2 = performance.now()
    const c2 = process.cpuUsage()
    // The first run's high-water mark holds everything (later runs reuse freed memory).
    if (run === 0) peakGrowth = Math.max(0, peakRss(reset) - rssBefore)
    const cpu = (a: NodeJS.CpuUsage, b: NodeJS.CpuUsage) => (b.user - a.user + b.system - a.system) / 1000
    runs.push({ readMs: t1 - t0, analyseMs: t2 - t1, readCpuMs: cpu(c0, c1), analyseCpuMs: cpu(c1, c2) })
    gc()
  }
  const report: ChildReport = { runs, peakGrowthMb: peakGrowth / 2 ** 20, fileMb: bytes.length / 2 ** 20 }
  process.stdout.write(JSON.stringify(report))
}

function measureInFreshProcess(bytes: Uint8Array): ChildReport {
  const folder = mkdtempSync(join(tmpdir(), 'cavitrace-bench-analysis-'))
  try {
    const file = join(folder, 'export.csv')
    writeFileSync(file, bytes)
    const child = spawnSync(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url), '--measure', file], { encoding: 'utf8' })
    if (child.status !== 0) throw new Error(`benchmark child failed: ${child.stderr}`)
    return JSON.parse(child.stdout) as ChildReport
  } finally {
    rmSync(folder, { recursive: true, force: true })
  }
}

export default async function bench(): Promise<void> {
  const f = (x: number) => x.toFixed(0)
  console.log('| samples | file MiB | run | read ms (CPU) | analyse ms (CPU) | read + analyse ms (CPU) |')
  console.log('|---|---|---|---|---|---|')
  const memory: string[] = []
  for (const sampleCount of [100_000, 1_000_000]) {
    const sim = generateSweptTrace({ ...preset, sampleCount, sampleIntervalSeconds: 1e-6 * (200_000 / sampleCount) * 5 })
    const report = measureInFreshProcess(csvOf(sim.tSeconds, sim.transmissionV, sim.rampV!))
    const warm = report.runs.slice(1)
    const best = warm.reduce((a, r) => (r.readMs + r.analyseMs < a.readMs + a.analyseMs ? r : a), warm[0])
    const rows: [string, Run][] = [['cold (first)', report.runs[0]], [`warm (best of ${warm.length})`, best]]
    for (const [label, r] of rows) {
      console.log(
        `| ${sampleCount} | ${report.fileMb.toFixed(1)} | ${label} | ${f(r.readMs)} (${f(r.readCpuMs)}) | ${f(r.analyseMs)} (${f(r.analyseCpuMs)}) | ${f(r.readMs + r.analyseMs)} (${f(r.readCpuMs + r.analyseCpuMs)}) |`,
      )
    }
    memory.push(`${sampleCount} samples: peak RSS growth ${report.peakGrowthMb.toFixed(1)} MiB = ${(report.peakGrowthMb / report.fileMb).toFixed(1)}× the file`)
  }
  console.log(`\nPeak memory of read + analyse (fresh process, file already loaded): ${memory.join('; ')}.`)
}

if (process.argv[2] === '--measure') measureHere(process.argv[3])
