import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { runCli } from '../../support/runCli'
import { generatedTraceCsv, testCavityGeometry } from '../../support/traceFiles'

interface Line {
  file: string
  fundamentalFraction?: number
  finesse?: number | null
  error?: { code: string; message: string }
}

let folder: string
let cavity: string
/** Input order: a long record first, so a later, shorter one finishes before it on another thread. */
let files: string[]

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), 'cavitrace-batch-'))
  cavity = join(folder, 'cavity.json')
  writeFileSync(cavity, JSON.stringify(testCavityGeometry))
  const write = (name: string, text: string) => {
    writeFileSync(join(folder, name), text)
    return join(folder, name)
  }
  files = [
    write('d-long.csv', generatedTraceCsv({ sampleCount: 200_000, sampleIntervalSeconds: 1e-6, seed: 11 })),
    write('a-short.csv', generatedTraceCsv({ seed: 12, orderPowers: [0.6, 0.3, 0.08, 0.02] })),
    write('c-notes.csv', 'not a trace at all\njust words\n'),
    write('b-short.csv', generatedTraceCsv({ seed: 13, orderPowers: [0.95, 0.02, 0.02, 0.01] })),
  ]
})

const linesOf = (stdout: string) =>
  stdout
    .trim()
    .split('\n')
    .map((line) => JSON.parse(line) as Line)

describe('cavitrace analyze with many files', () => {
  it('when files are named then it writes one JSON line per file in input order, errors in place, and exits 1', () => {
    const missing = join(folder, 'missing.csv')
    const run = runCli(['analyze', ...files, missing, '--cavity', cavity, '--threads', '2'])
    expect(run.status).toBe(1)
    const lines = linesOf(run.stdout)
    expect(lines.map((line) => line.file)).toEqual([...files, missing])
    expect(lines[2]).toEqual({ file: files[2], error: { code: 'no_numeric_data', message: expect.any(String) } })
    expect(lines[4].error?.code).toBe('file_not_found')
    // Each good file's result is the one the single-file command gives.
    for (const index of [0, 1, 3]) {
      const single = JSON.parse(runCli(['analyze', files[index], '--cavity', cavity]).stdout) as Line
      expect(lines[index].fundamentalFraction).toBe(single.fundamentalFraction)
      expect(lines[index].error).toBeUndefined()
    }
    expect(lines[1].fundamentalFraction).toBeLessThan(lines[3].fundamentalFraction!)
    // Not a terminal: no progress bar.
    expect(run.stderr).toBe('')
  })

  it('when a folder is named then it takes its exports by name and skips temporary and hidden files', () => {
    const sub = join(folder, 'night-run')
    mkdirSync(sub)
    const good = generatedTraceCsv({ seed: 21 })
    for (const name of ['scan-002.csv', 'scan-001.txt', '.scan-003.csv', 'scan-004.csv.tmp', '~scan-005.csv', 'readme.md']) writeFileSync(join(sub, name), good)
    const run = runCli(['analyze', sub, '--cavity', cavity])
    expect(run.status).toBe(0)
    expect(linesOf(run.stdout).map((line) => line.file)).toEqual([join(sub, 'scan-001.txt'), join(sub, 'scan-002.csv')])
  })

  it('when --csv is given then it writes the headline fields with one row per file in order', () => {
    const run = runCli(['analyze', ...files, '--cavity', cavity, '--csv'])
    expect(run.status).toBe(1)
    const rows = run.stdout.trim().split('\n')
    expect(rows[0]).toBe('file,fundamentalFraction,fundamentalFractionError,misalignmentShare,mismatchShare,finesse,linewidthHz,fsrHz,warnings,error')
    expect(rows).toHaveLength(files.length + 1)
    const json = linesOf(runCli(['analyze', ...files, '--cavity', cavity]).stdout)
    rows.slice(1).forEach((row, index) => {
      const cells = row.split(',')
      expect(cells[0]).toBe(files[index])
      if (json[index].error) {
        expect(cells.slice(1, 9).every((cell) => cell === '')).toBe(true)
        expect(cells[9]).toMatch(/^no_numeric_data: /)
      } else {
        expect(Number(cells[1])).toBe(json[index].fundamentalFraction)
        expect(cells[5] === '' ? null : Number(cells[5])).toBe(json[index].finesse)
        expect(cells[9]).toBe('')
      }
    })
  })
})
