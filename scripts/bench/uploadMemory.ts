/**
 * Server memory during large uploads (issue 17: "a 1 GB upload never raises the server's RSS by more than 100 MB").
 * The server runs in its own process against a throwaway PostgreSQL; each upload is streamed from generated export
 * text (chunked, no Content-Length, so the server cannot refuse it early) while the server's RSS is sampled every
 * 50 ms from /proc. Prints the RSS before, the peak and the rise, and the answer.
 */
import { readFileSync } from 'node:fs'
import { request } from 'node:http'
import { generatedTraceCsv } from '../../tests/support/traceFiles'
import { startServerProcess, withBenchLab } from './api'

const MB = 1024 * 1024

function rssMb(pid: number): number {
  const line = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'))
  return line ? Number(line[1]) / 1024 : NaN
}

/** Stream `totalBytes` of export text (one generated trace repeated) as one multipart file; resolves with the answer. */
function streamUpload(url: string, path: string, authorization: string, totalBytes: number): Promise<{ status: number; body: string }> {
  const block = Buffer.from(generatedTraceCsv({ sampleCount: 100_000, seed: 900 }))
  const boundary = 'bench-boundary'
  return new Promise((resolve, reject) => {
    const { hostname, port } = new URL(url)
    const req = request({ hostname, port, method: 'POST', path, headers: { Authorization: authorization, 'Content-Type': `multipart/form-data; boundary=${boundary}`, 'Transfer-Encoding': 'chunked' } }, (res) => {
      let body = ''
      res.on('data', (chunk) => (body += chunk))
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body }))
    })
    req.on('error', reject)
    let sent = 0
    let closed = false
    req.on('close', () => (closed = true))
    req.write(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="big.csv"\r\nContent-Type: text/csv\r\n\r\n`)
    const pump = () => {
      while (sent < totalBytes && !closed) {
        const piece = block.subarray(0, Math.min(block.length, totalBytes - sent))
        sent += piece.length
        if (!req.write(piece)) return void req.once('drain', pump)
      }
      if (!closed) req.end(`\r\n--${boundary}--\r\n`)
    }
    pump()
  })
}

export default async function benchUploadMemory(): Promise<void> {
  await withBenchLab('bench-upload', async ({ url, token, cavityId }) => {
    const sizesMb = (process.env.CAVITRACE_BENCH_UPLOAD_MB ?? '200,1024').split(',').map(Number)
    const limitMb = process.env.CAVITRACE_BENCH_UPLOAD_LIMIT_MB ?? '200'
    console.log(`UPLOAD_LIMIT_MB=${limitMb}; WORKER_THREADS=0 (no analysis in the server, so only the upload shows)`)
    console.log('| upload | answer | RSS before | peak RSS | rise | wall |')
    console.log('|---|---|---|---|---|---|')
    for (const sizeMb of sizesMb) {
      const server = await startServerProcess({ DATABASE_URL: url, WORKER_THREADS: '0', UPLOAD_LIMIT_MB: limitMb, UPLOAD_TOTAL_LIMIT_MB: limitMb })
      try {
        await new Promise((resolve) => setTimeout(resolve, 1000))
        const before = rssMb(server.pid)
        let peak = before
        const sampler = setInterval(() => (peak = Math.max(peak, rssMb(server.pid))), 50)
        const started = performance.now()
        const answer = await streamUpload(server.url, `/api/cavities/${cavityId}/traces`, `Bearer ${token}`, sizeMb * MB)
        const wall = performance.now() - started
        await new Promise((resolve) => setTimeout(resolve, 200))
        clearInterval(sampler)
        const summary = answer.status === 202 ? '202 stored' : `${answer.status} ${(JSON.parse(answer.body) as { error: { code: string } }).error.code}`
        console.log(`| ${sizeMb} MB | ${summary} | ${before.toFixed(0)} MB | ${peak.toFixed(0)} MB | ${(peak - before).toFixed(0)} MB | ${(wall / 1000).toFixed(1)} s |`)
      } finally {
        await server.stop()
      }
    }
  })
}
