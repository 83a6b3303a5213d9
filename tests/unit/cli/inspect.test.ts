import { spawnSync } from 'node:child_process'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'

const root = join(dirname(fileURLToPath(import.meta.url)), '../../..')

function inspect(...args: string[]): { status: number | null; json: Record<string, unknown> } {
  const run = spawnSync(process.execPath, ['--import', 'tsx', join(root, 'scripts/inspect.ts'), ...args], {
    cwd: root,
    encoding: 'utf8',
  })
  return { status: run.status, json: JSON.parse(run.stdout) as Record<string, unknown> }
}

describe('scripts/inspect.ts', () => {
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

  it('when the file is missing or a flag is wrong then it prints an error object and exits non-zero', () => {
    const missing = inspect('fixtures/real/no-such-file.csv')
    expect(missing.status).not.toBe(0)
    expect((missing.json.error as { code: string }).code).toBe('file_not_found')
    const badFlag = inspect('fixtures/real/planoconcave_633nm_L150mm_R300mm_ramp_2ch.csv', '--interval', 'soon')
    expect(badFlag.status).not.toBe(0)
    expect((badFlag.json.error as { code: string }).code).toBe('bad_argument')
  })
})
