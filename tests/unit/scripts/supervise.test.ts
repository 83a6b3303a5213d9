/** `npm start` keeps the server up: scripts/lib/supervise.mjs with real child processes. */
import { spawn } from 'node:child_process'
import { existsSync, mkdtempSync, readFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { EXIT_CONFIG, supervise } from '../../../scripts/lib/supervise.mjs'

/** A child that appends a line to `log` and then runs `body`. */
function child(log: string, body: string) {
  return spawn(process.execPath, ['-e', `require('fs').appendFileSync(${JSON.stringify(log)}, 'run\\n'); ${body}`], { stdio: 'ignore' })
}

const runsIn = (log: string) => readFileSync(log, 'utf8').trim().split('\n').length

describe('supervise', () => {
  it('when the child crashes twice and then exits cleanly then it was started three times', async () => {
    const log = join(mkdtempSync(join(tmpdir(), 'supervise-')), 'runs')
    const crashes: unknown[] = []
    const code = await supervise({
      start: () => child(log, `const n = require('fs').readFileSync(${JSON.stringify(log)}, 'utf8').split('\\n').length - 1; process.exit(n < 3 ? 3 : 0)`),
      onCrash: (crash: unknown) => crashes.push(crash),
      delayMs: 10,
    })
    expect(code).toBe(0)
    expect(runsIn(log)).toBe(3)
    expect(crashes).toEqual([{ exitCode: 3, signal: null, givingUp: false }, { exitCode: 3, signal: null, givingUp: false }])
  })

  it('when the child is killed with SIGKILL then it is started again, and asked to stop it stays stopped', async () => {
    const log = join(mkdtempSync(join(tmpdir(), 'supervise-')), 'runs')
    let stopping = false
    let starts = 0
    const code = await supervise({
      start: () => {
        starts += 1
        const process_ = child(log, 'setInterval(() => {}, 1000)')
        // Once this run has written its line: the first is killed as by `kill -9`, the second stopped on purpose.
        const run = starts
        const whenRunning = setInterval(() => {
          if (!existsSync(log) || runsIn(log) < run) return
          clearInterval(whenRunning)
          if (run === 2) stopping = true
          process_.kill(run === 1 ? 'SIGKILL' : 'SIGTERM')
        }, 20)
        return process_
      },
      isStopping: () => stopping,
      delayMs: 10,
    })
    expect(starts).toBe(2)
    expect(runsIn(log)).toBe(2)
    expect(code).toBe(0)
  })

  it('when the child keeps crashing then it gives up after maxCrashes, and bad configuration is not retried', async () => {
    const log = join(mkdtempSync(join(tmpdir(), 'supervise-')), 'runs')
    const code = await supervise({ start: () => child(log, 'process.exit(2)'), delayMs: 5, maxCrashes: 3 })
    expect(code).toBe(2)
    expect(runsIn(log)).toBe(3)
    const configLog = join(mkdtempSync(join(tmpdir(), 'supervise-')), 'runs')
    expect(await supervise({ start: () => child(configLog, `process.exit(${EXIT_CONFIG})`), delayMs: 5 })).toBe(EXIT_CONFIG)
    expect(runsIn(configLog)).toBe(1)
  })
})
