/**
 * The built server (`node dist/server/main.js`) as its own process on a fixed port, so a test can stop it and start
 * it again on the same address (as a restart in the lab would).
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { createServer } from 'node:net'
import { fileURLToPath } from 'node:url'

const projectRoot = fileURLToPath(new URL('../..', import.meta.url))

/** A port that was free a moment ago on 127.0.0.1. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer()
    probe.once('error', reject)
    probe.listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as { port: number }
      probe.close(() => resolve(port))
    })
  })
}

export interface ServerProcess {
  url: string
  stop(): Promise<void>
}

export function startServerProcess(databaseUrl: string, port: number): Promise<ServerProcess> {
  const child: ChildProcess = spawn(process.execPath, ['dist/server/main.js'], {
    cwd: projectRoot,
    env: { ...process.env, NODE_ENV: 'test', PORT: String(port), DATABASE_URL: databaseUrl, LOG_LEVEL: 'warn', WORKER_THREADS: '1' },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  const log: string[] = []
  const stop = () =>
    new Promise<void>((resolve) => {
      if (child.exitCode !== null || child.signalCode !== null) return resolve()
      child.once('exit', () => resolve())
      child.kill('SIGTERM')
    })
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`server did not start: ${log.join('')}`)), 30_000)
    child.stderr!.on('data', (chunk: Buffer) => log.push(chunk.toString()))
    child.stdout!.on('data', (chunk: Buffer) => {
      log.push(chunk.toString())
      const match = /CAVITRACE_LISTENING (\S+)/.exec(chunk.toString())
      if (match) {
        clearTimeout(timer)
        resolve({ url: match[1], stop })
      }
    })
    child.once('exit', (code) => reject(new Error(`server exited with ${code}: ${log.join('')}`)))
  })
}
