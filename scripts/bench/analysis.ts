/**
 * `npm run bench -- analysis`: read + analyse a two-channel CSV export (time, transmission, ramp) of 100,000 and
 * 1,000,000 samples, and analyse alone. Each size runs in two fresh processes with the file already loaded, so the
 * generator's arrays do not count: in one the first read + analyse is cold (the JavaScript engine has not compiled
 * the hot loops yet); the other first calls warmUpAnalysis() as a worker would at start, then reads and analyses
 * the file RUNS times with a forced full collection after each (its first run is the first upload to a warmed-up
 * worker), then RUNS times more without one (steady state of a busy worker; the median is printed).
 * Wall time sits beside CPU time because the machine may be shared. Peak memory is the high-water RSS growth of
 * the cold read + analyse against the file size (the file's own bytes are already resident and not counted).
 */
import { spawnSync } from 'node:child_process'
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { runInNewContext } from 'node:vm'
import { setFlagsFromString } from 'node:v8'
import { analyzeTrace } from '../../shared/analysis/analyzeTrace'
import { warmUpAnalysis } from '../../shared/analysis/warmUpAnalysis'
import { readTrace } from '../../shared/trace/readTrace'
import { benchExport, benchPreset as preset } from '../lib/benchExports'

const RUNS = 6

interface Run {
  readMs: number
  analyseMs: number
  readCpuMs: number
  analyseCpuMs: number
}

interface ChildReport {
  runs: Run[]
  /** Warm runs with no forced collection between them. */
  steady: Run[]
  peakGrowthMb: number
  fileMb: number
}

/** One read + analyse of the export, timed in wall and CPU time. */
function readAndAnalyse(bytes: Uint8Array): Run {
  const cpu = (a: NodeJS.CpuUsage, b: NodeJS.CpuUsage) => (b.user - a.user + b.system - a.system) / 1000
  const c0 = process.cpuUsage()
  const t0 = performance.now()
  const trace = readTrace(bytes)
  const t1 = performance.now()
  const c1 = process.cpuUsage()
  analyzeTrace(trace, preset.cavity!)
  const t2 = performance.now()
  const c2 = process.cpuUsage()
  return { readMs: t1 - t0, analyseMs: t2 - t1, readCpuMs: cpu(c0, c1), analyseCpuMs: cpu(c1, c2) }
}

/** Runs in the fresh process: the file is loaded first (and the engine warmed up when asked), then read + analysed. */
function measureHere(file: string, warm: boolean): void {
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
  if (warm) warmUpAnalysis()
  gc()
  const reset = resetPeak()
  const rssBefore = process.memoryUsage().rss
  const runs: Run[] = []
  let peakGrowth = 0
  for (let run = 0; run < (warm ? RUNS : 1); run++) {
    runs.push(readAndAnalyse(bytes))
    // The first run's high-water mark holds everything (later runs reuse freed memory).
    if (run === 0) peakGrowth = Math.max(0, peakRss(reset) - rssBefore)
    gc()
  }
  // Steady state: the same again without a forced full collection between runs, as a busy worker runs. (A forced
  // full collection leaves the next run to rebuild the young generation, which costs the analysis 10–15 ms.)
  const steady = warm ? Array.from({ length: RUNS }, () => readAndAnalyse(bytes)) : []
  const report: ChildReport = { runs, steady, peakGrowthMb: peakGrowth / 2 ** 20, fileMb: bytes.length / 2 ** 20 }
  process.stdout.write(JSON.stringify(report))
}

function measureInFreshProcess(bytes: Uint8Array, warm: boolean): ChildReport {
  const folder = mkdtempSync(join(tmpdir(), 'cavitrace-bench-analysis-'))
  try {
    const file = join(folder, 'export.csv')
    writeFileSync(file, bytes)
    const child = spawnSync(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url), '--measure', file, warm ? 'warm' : 'cold'], { encoding: 'utf8' })
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
    const bytes = benchExport(sampleCount)
    const report = measureInFreshProcess(bytes, false)
    const warmed = measureInFreshProcess(bytes, true)
    // Best by CPU time: on a shared machine wall time mostly measures the other processes.
    const best = warmed.runs.reduce((a, r) => (r.readCpuMs + r.analyseCpuMs < a.readCpuMs + a.analyseCpuMs ? r : a), warmed.runs[0])
    const median = (runs: Run[], key: keyof Run) => runs.map((r) => r[key]).sort((a, b) => a - b)[runs.length >> 1]
    const steady: Run = {
      readMs: median(warmed.steady, 'readMs'),
      analyseMs: median(warmed.steady, 'analyseMs'),
      readCpuMs: median(warmed.steady, 'readCpuMs'),
      analyseCpuMs: median(warmed.steady, 'analyseCpuMs'),
    }
    const rows: [string, Run][] = [
      ['cold process, first', report.runs[0]],
      ['after warm-up, first', warmed.runs[0]],
      [`after warm-up, best of ${warmed.runs.length} (by CPU)`, best],
      [`steady, no forced collection, median of ${warmed.steady.length}`, steady],
    ]
    for (const [label, r] of rows) {
      console.log(
        `| ${sampleCount} | ${report.fileMb.toFixed(1)} | ${label} | ${f(r.readMs)} (${f(r.readCpuMs)}) | ${f(r.analyseMs)} (${f(r.analyseCpuMs)}) | ${f(r.readMs + r.analyseMs)} (${f(r.readCpuMs + r.analyseCpuMs)}) |`,
      )
    }
    memory.push(`${sampleCount} samples: peak RSS growth ${report.peakGrowthMb.toFixed(1)} MiB = ${(report.peakGrowthMb / report.fileMb).toFixed(1)}× the file`)
  }
  console.log(`\nPeak memory of read + analyse (fresh process, file already loaded): ${memory.join('; ')}.`)
}

if (process.argv[2] === '--measure') measureHere(process.argv[3], process.argv[4] === 'warm')
