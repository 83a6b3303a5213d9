/**
 * Client budgets (PRODUCT.md): a 1,000,000-point trace reduced by min/max decimation for drawing, and
 * the size of the JavaScript a first visit loads (gzip). The decimation runs here in Node, the same code
 * the chart runs in the browser; drawing the ~2,400 kept points is uPlot's part and is not timed here.
 */
import { execFileSync } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { gzipSync } from 'node:zlib'
import { decimateMinMax } from '../../src/components/trace/decimateMinMax'
import { projectRoot } from '../lib/services.mjs'

export default async function benchClient(): Promise<void> {
  const n = 1_000_000
  const x = new Float64Array(n)
  const y = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    x[i] = i * 1e-6
    y[i] = Math.sin(i / 50) + (i % 997 === 0 ? 3 : 0)
  }
  decimateMinMax(x, y, 1200) // warm-up
  const times: number[] = []
  for (let run = 0; run < 7; run++) {
    const started = performance.now()
    decimateMinMax(x, y, 1200)
    times.push(performance.now() - started)
  }
  times.sort((a, b) => a - b)
  console.log(`| min/max decimation, 1,000,000 points → 1,200 buckets | median ${times[3].toFixed(1)} ms | worst ${times[6].toFixed(1)} ms | target (with drawing) < 200 ms |`)

  // Initial JavaScript: the entry script and the modules it preloads, as a fresh build writes them.
  execFileSync(join(projectRoot, 'node_modules', '.bin', 'vite'), ['build', '--logLevel', 'error', '--outDir', 'dist/bench-client'], { cwd: projectRoot })
  const outDir = join(projectRoot, 'dist', 'bench-client')
  const html = readFileSync(join(outDir, 'index.html'), 'utf8')
  const scripts = [...html.matchAll(/(?:src|href)="\/(assets\/[^"]+\.js)"/g)].map((match) => match[1])
  const gzipBytes = scripts.reduce((sum, file) => sum + gzipSync(readFileSync(join(outDir, file)), { level: 9 }).length, 0)
  console.log(`| initial client JavaScript (${scripts.length} file(s) named in index.html) | ${(gzipBytes / 1024).toFixed(1)} kB gzip | target < 350 kB |`)
}
