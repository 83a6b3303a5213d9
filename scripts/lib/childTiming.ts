/**
 * Timing child processes for the benchmarks: wall time around the spawn, and the CPU time the children used (Linux
 * /proc/self/stat, children's user + system time, 10 ms resolution), so a shared machine's load shows as the gap.
 */
import { spawnSync, type SpawnSyncOptions } from 'node:child_process'
import { readFileSync } from 'node:fs'

const TICK_MS = 10 // USER_HZ is 100 on Linux

/** CPU time used so far by this process's finished children, ms. */
export function childrenCpuMs(): number {
  try {
    const fields = readFileSync('/proc/self/stat', 'utf8').split(') ')[1].split(' ')
    // After the name: state is field 3 of the full line, so cutime (16) and cstime (17) sit at 13 and 14 here.
    return (Number(fields[13]) + Number(fields[14])) * TICK_MS
  } catch {
    return NaN
  }
}

export interface ChildRun {
  wallMs: number
  cpuMs: number
  status: number | null
  stdout: string
  stderr: string
}

export function timeChild(command: string, args: string[], options: SpawnSyncOptions = {}): ChildRun {
  const cpu0 = childrenCpuMs()
  const t0 = performance.now()
  const run = spawnSync(command, args, { encoding: 'utf8', maxBuffer: 256 * 2 ** 20, ...options })
  const wallMs = performance.now() - t0
  return { wallMs, cpuMs: childrenCpuMs() - cpu0, status: run.status, stdout: String(run.stdout ?? ''), stderr: String(run.stderr ?? '') }
}

export const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b)
  const mid = sorted.length >> 1
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2
}

/**
 * A --import hook that prints the process's peak resident memory (bytes) on stderr as it exits. It reads VmHWM
 * (Linux), not getrusage's maxrss: that one keeps the parent's size at the fork, so it would report the benchmark's.
 */
export const peakRssHook = `data:text/javascript,${encodeURIComponent(
  "import { readFileSync } from 'node:fs'; process.on('exit', () => process.stderr.write('PEAK_RSS ' + Number(/VmHWM:\\s+(\\d+)/.exec(readFileSync('/proc/self/status', 'utf8'))[1]) * 1024 + '\\n'))",
)}`

export function peakRssOf(run: ChildRun): number {
  const match = /PEAK_RSS (\d+)/.exec(run.stderr)
  return match ? Number(match[1]) : NaN
}
