/**
 * `npm run bench -- batch`: 200 exports of 100,000 samples (ten noise draws, each written twenty times) analysed by
 * one `cavitrace analyze DIR` process on worker threads, against the same files analysed one process each — one
 * at a time, and as many at a time as there are cores. Files a second, wall clock.
 */
import { spawn } from 'node:child_process'
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { availableParallelism, loadavg, tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { buildCodeIfStale } from '../build.mjs'
import { benchExport, benchPreset } from '../lib/benchExports'
import { childrenCpuMs, timeChild } from '../lib/childTiming'

const FILES = 200
const DRAWS = 10
const cli = fileURLToPath(new URL('../../bin/cavitrace.mjs', import.meta.url))

/** Run one process per file, `parallel` at a time; resolves with the wall time in ms. */
function oneProcessEach(files: string[], cavity: string, parallel: number): Promise<number> {
  const started = performance.now()
  let next = 0
  let failed = 0
  return new Promise((resolve, reject) => {
    let running = 0
    const launch = () => {
      if (next >= files.length && running === 0) {
        if (failed > 0) reject(new Error(`${failed} single-file runs failed`))
        else resolve(performance.now() - started)
        return
      }
      while (running < parallel && next < files.length) {
        running++
        const child = spawn(process.execPath, [cli, 'analyze', files[next++], '--cavity', cavity], { stdio: 'ignore' })
        child.on('exit', (code) => {
          if (code !== 0) failed++
          running--
          launch()
        })
      }
    }
    launch()
  })
}

export default async function bench(): Promise<void> {
  await buildCodeIfStale()
  const folder = mkdtempSync(join(tmpdir(), 'cavitrace-bench-batch-'))
  try {
    const cavity = join(folder, 'cavity.json')
    writeFileSync(cavity, JSON.stringify(benchPreset.cavity))
    const exportsDir = join(folder, 'exports')
    const files: string[] = []
    const draws = Array.from({ length: DRAWS }, (_, k) => benchExport(100_000, 500 + k))
    mkdirSync(exportsDir)
    for (let i = 0; i < FILES; i++) {
      const file = join(exportsDir, `scan-${String(i).padStart(3, '0')}.csv`)
      writeFileSync(file, draws[i % DRAWS])
      files.push(file)
    }
    const cores = availableParallelism()
    console.log(`${FILES} exports of 100,000 samples (${(draws[0].length / 2 ** 20).toFixed(1)} MiB each), ${cores} cores; load average before: ${loadavg().map((x) => x.toFixed(1)).join(' ')}`)
    console.log('| how | wall s | files/s | CPU s |')
    console.log('|---|---|---|---|')
    const batch = timeChild(process.execPath, [cli, 'analyze', exportsDir, '--cavity', cavity])
    const lines = batch.stdout.trim().split('\n')
    if (lines.length !== FILES || lines.some((line) => line.includes('"error"'))) throw new Error(`the batch did not analyse every file: ${batch.stdout.slice(0, 400)}`)
    const row = (how: string, ms: number, cpuMs: number) => console.log(`| ${how} | ${(ms / 1000).toFixed(1)} | ${(FILES / (ms / 1000)).toFixed(1)} | ${Number.isFinite(cpuMs) ? (cpuMs / 1000).toFixed(1) : '—'} |`)
    row(`one \`cavitrace analyze DIR\`, ${cores} worker threads`, batch.wallMs, batch.cpuMs)
    for (const parallel of [1, cores]) {
      const cpu0 = childrenCpuMs()
      const ms = await oneProcessEach(files, cavity, parallel)
      row(`one process per file, ${parallel} at a time`, ms, childrenCpuMs() - cpu0)
    }
    console.log(`load average after: ${loadavg().map((x) => x.toFixed(1)).join(' ')}`)
  } finally {
    rmSync(folder, { recursive: true, force: true })
  }
}
