import { describe, expect, it } from 'vitest'
import { errorOf, runCli } from '../../support/runCli'

function inspect(...args: string[]) {
  const run = runCli(['inspect', ...args])
  return { status: run.status, json: JSON.parse(run.stdout) as Record<string, unknown> }
}

describe('cavitrace inspect', () => {
  it('when given a real export then it prints the summary as JSON', () => {
    const { status, json } = inspect('fixtures/real/planoconcave_633nm_L150mm_R300mm_ramp_2ch.csv')
    expect(status).toBe(0)
    expect(json.sampleCount).toBe(2500)
    expect(json.sampleInterval as number).toBeCloseTo(1e-5, 10)
    expect((json.channels as { role: string }[]).map((channel) => channel.role)).toEqual(['ramp', 'transmission'])
    expect((json.warnings as { code: string }[])[0].code).toBe('time_axis_repaired')
    expect(json).toHaveProperty('metadata')
    expect(json).toHaveProperty('startTime')
  })

  it('when the file is missing then it prints an error object and exits 1', () => {
    const missing = runCli(['inspect', 'fixtures/real/no-such-file.csv'])
    expect(missing.status).toBe(1)
    expect(errorOf(missing).code).toBe('file_not_found')
  })

  it('when a flag is wrong then it prints an error object and exits 2', () => {
    const badFlag = runCli(['inspect', 'fixtures/real/planoconcave_633nm_L150mm_R300mm_ramp_2ch.csv', '--interval', 'soon'])
    expect(badFlag.status).toBe(2)
    expect(errorOf(badFlag).code).toBe('bad_argument')
    expect(errorOf(badFlag).message).toContain('--interval')
  })
})
