/**
 * Run the `cavitrace` command as installed (bin/cavitrace.mjs → dist/cli, built by the tests' global set-up) and
 * collect what it printed.
 */
import { spawn, spawnSync } from 'node:child_process'
import { fileURLToPath } from 'node:url'

export const projectRoot = fileURLToPath(new URL('../..', import.meta.url))
const cli = fileURLToPath(new URL('../../bin/cavitrace.mjs', import.meta.url))

export interface CliRun {
  status: number | null
  stdout: string
  stderr: string
}

export function runCli(args: string[], options: { env?: Record<string, string> } = {}): CliRun {
  const run = spawnSync(process.execPath, [cli, ...args], { cwd: projectRoot, encoding: 'utf8', env: { ...process.env, ...options.env }, maxBuffer: 64 * 2 ** 20 })
  return { status: run.status, stdout: run.stdout, stderr: run.stderr }
}

/** The same, without blocking the test's event loop (for a server running in the test process). */
export function runCliAsync(args: string[]): Promise<CliRun> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [cli, ...args], { cwd: projectRoot })
    let stdout = ''
    let stderr = ''
    child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString()))
    child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()))
    child.on('close', (status) => resolve({ status, stdout, stderr }))
  })
}

/** The JSON error object a failed command prints on stdout. */
export function errorOf(run: CliRun): { code: string; message: string } {
  return (JSON.parse(run.stdout) as { error: { code: string; message: string } }).error
}
