import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { errorOf, runCli } from '../../support/runCli'
import { generatedTraceCsv, testCavityGeometry } from '../../support/traceFiles'

let folder: string
let trace: string
let cavity: string

beforeAll(() => {
  folder = mkdtempSync(join(tmpdir(), 'cavitrace-cli-'))
  trace = join(folder, 'scan.csv')
  cavity = join(folder, 'cavity.json')
  writeFileSync(trace, generatedTraceCsv())
  writeFileSync(cavity, JSON.stringify(testCavityGeometry))
  mkdirSync(join(folder, 'empty'))
})

describe('cavitrace: help and exit status', () => {
  it('when asked for help then it lists the four commands and the exit codes, and exits 0', () => {
    const help = runCli(['--help'])
    expect(help.status).toBe(0)
    for (const command of ['analyze', 'inspect', 'generate', 'watch']) expect(help.stdout).toMatch(new RegExp(`^  ${command} `, 'm'))
    expect(help.stdout).toContain('Exit status: 0 ok, 1 analysis refused, 2 usage error.')
    const analyzeHelp = runCli(['analyze', '--help'])
    expect(analyzeHelp.status).toBe(0)
    expect(analyzeHelp.stdout.split('\n')[0]).toBe('Usage: cavitrace analyze FILE... | DIR --cavity CAVITY.json [options]')
    expect(runCli(['help', 'watch']).stdout).toContain('CAVITRACE_TOKEN')
  })

  it('when the command line is wrong then it exits 2 with a JSON error naming the problem', () => {
    const cases: [string[], string, string][] = [
      [[], '', ''],
      [['frobnicate'], 'unknown_command', 'frobnicate'],
      [['analyze', trace], 'bad_argument', '--cavity'],
      [['analyze', trace, '--cavity', cavity, '--colour'], 'bad_argument', '--colour'],
      [['analyze', trace, '--cavity', cavity, '--sweep-direction', 'sideways'], 'bad_argument', 'sideways'],
      [['analyze', trace, '--cavity', cavity, '--threads', '0'], 'bad_argument', '--threads'],
      [['analyze', trace, '--cavity', join(folder, 'none.json')], 'file_not_found', 'none.json'],
      [['analyze', trace, '--cavity', trace], 'invalid_json', 'not valid JSON'],
      [['analyze', join(folder, 'empty'), '--cavity', cavity], 'no_files', 'holds no exports'],
      [['generate', '--preset', 'no-such-preset', '--out', join(folder, 'x.csv')], 'bad_argument', 'reference-1064'],
      [['watch', folder, '--cavity', '1', '--url', 'http://127.0.0.1:9'], 'no_token', 'CAVITRACE_TOKEN'],
    ]
    for (const [args, code, mentions] of cases) {
      const run = runCli(args, { env: { CAVITRACE_TOKEN: '' } })
      expect(run.status, args.join(' ')).toBe(2)
      if (code === '') {
        expect(run.stdout).toContain('Usage: cavitrace COMMAND')
        continue
      }
      expect(errorOf(run).code, args.join(' ')).toBe(code)
      expect(errorOf(run).message).toContain(mentions)
    }
  })

  it('when the cavity geometry is invalid then it exits 2 naming the field', () => {
    const bad = join(folder, 'bad-cavity.json')
    writeFileSync(bad, JSON.stringify({ ...testCavityGeometry, lengthMm: -3 }))
    const run = runCli(['analyze', trace, '--cavity', bad])
    expect(run.status).toBe(2)
    expect(errorOf(run)).toMatchObject({ code: 'invalid_geometry' })
    expect(errorOf(run).message).toContain('lengthMm')
  })

  it('when the engine refuses the file then it exits 1 with the engine code', () => {
    const notATrace = join(folder, 'notes.csv')
    writeFileSync(notATrace, 'these are my notes, not a trace\nsecond line\n')
    const refused = runCli(['analyze', notATrace, '--cavity', cavity])
    expect(refused.status).toBe(1)
    expect(errorOf(refused).code).toBe('no_numeric_data')
    const missing = runCli(['analyze', join(folder, 'gone.csv'), '--cavity', cavity])
    expect(missing.status).toBe(1)
    expect(errorOf(missing).code).toBe('file_not_found')
  })

  it('when the file is analysed then it prints one JSON object and exits 0', () => {
    const run = runCli(['analyze', trace, '--cavity', cavity])
    expect(run.status).toBe(0)
    const result = JSON.parse(run.stdout) as { fundamentalFraction: number; fsr: { hz: number } }
    expect(result.fundamentalFraction).toBeGreaterThan(0.7)
    expect(result.fundamentalFraction).toBeLessThan(0.9)
    expect(result.fsr.hz).toBeGreaterThan(0)
  })

  it('when a trace is generated then its three files are written and the analysis reads them', () => {
    const out = join(folder, 'gen.csv')
    const run = runCli(['generate', '--preset', 'reference-1064', '--out', out, '--samples', '50000', '--seed', '3'])
    expect(run.status).toBe(0)
    expect(run.stdout).toContain('50000 samples')
    const analysed = runCli(['analyze', out, '--cavity', join(folder, 'gen.cavity.json')])
    expect(analysed.status).toBe(0)
  })
})
