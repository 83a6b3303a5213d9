/**
 * `npm run bench -- cold`: a fresh `cavitrace analyze` process (the built tool, dist/cli) on a 100,000- and a
 * 1,000,000-sample export, end to end as a lab script would call it, against `node -e 0` measured in the same run
 * (alternating, RUNS times each; median and best). Also the start-up alone: the tool asked to analyse a file that
 * does not exist gets as far as the first file access and stops. CPU is the children's user + system time.
 * Peak memory is the whole process's peak resident set against the file size.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { loadavg, tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { buildCodeIfStale } from '../build.mjs'
import { benchExport, benchPreset } from '../lib/benchExports'
import { median, peakRssHook, peakRssOf, timeChild, type ChildRun } from '../lib/childTiming'

const RUNS = 7
const cli = fileURLToPath(new URL('../../bin/cavitrace.mjs', import.meta.url))

function summary(runs: ChildRun[]): string {
  const wall = runs.map((r) => r.wallMs)
  const cpu = runs.map((r) => r.cpuMs)
  return `${median(wall).toFixed(0)} (${Math.min(...wall).toFixed(0)}) | ${median(cpu).toFixed(0)}`
}

export default async function bench(): Promise<void> {
  await buildCodeIfStale()
  const folder = mkdtempSync(join(tmpdir(), 'cavitrace-bench-cold-'))
  try {
    const cavity = join(folder, 'cavity.json')
    writeFileSync(cavity, JSON.stringify(benchPreset.cavity))
    const cases: { label: string; args: string[]; fileBytes?: number }[] = [{ label: 'start-up to the first file access (a missing file)', args: [cli, 'analyze', join(folder, 'missing.csv'), '--cavity', cavity] }]
    for (const sampleCount of [100_000, 1_000_000]) {
      const bytes = benchExport(sampleCount)
      const file = join(folder, `export-${sampleCount}.csv`)
      writeFileSync(file, bytes)
      cases.push({ label: `analyze, ${sampleCount.toLocaleString('en-GB')} samples (${(bytes.length / 2 ** 20).toFixed(1)} MiB)`, args: [cli, 'analyze', file, '--cavity', cavity], fileBytes: bytes.length })
    }
    const nodePeak = peakRssOf(timeChild(process.execPath, ['--import', peakRssHook, '-e', '0']))
    console.log(`load average before: ${loadavg().map((x) => x.toFixed(1)).join(' ')}; ${RUNS} runs each, alternating with node -e 0`)
    console.log('| fresh process | wall ms median (best) \\| CPU ms median | node -e 0 same run: wall median (best) \\| CPU | peak memory |')
    console.log('|---|---|---|---|')
    for (const { label, args, fileBytes } of cases) {
      const runs: ChildRun[] = []
      const baseline: ChildRun[] = []
      for (let i = 0; i < RUNS; i++) {
        baseline.push(timeChild(process.execPath, ['-e', '0']))
        const run = timeChild(process.execPath, args)
        if (fileBytes !== undefined && run.status !== 0) throw new Error(`cavitrace analyze failed: ${run.stdout.slice(0, 400)}`)
        runs.push(run)
      }
      let memory = '—'
      if (fileBytes !== undefined) {
        const peak = peakRssOf(timeChild(process.execPath, ['--import', peakRssHook, ...args]))
        memory = `${(peak / 2 ** 20).toFixed(0)} MiB = ${(peak / fileBytes).toFixed(1)}× the file (${((peak - nodePeak) / fileBytes).toFixed(1)}× above node -e 0's ${(nodePeak / 2 ** 20).toFixed(0)} MiB)`
      }
      console.log(`| ${label} | ${summary(runs)} | ${summary(baseline)} | ${memory} |`)
    }
    console.log(`load average after: ${loadavg().map((x) => x.toFixed(1)).join(' ')}`)
  } finally {
    rmSync(folder, { recursive: true, force: true })
  }
}
