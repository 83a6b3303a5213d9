/**
 * `cavitrace generate --preset NAME --out FILE.csv [--seed N] [--samples N]` (or `--list`): a synthetic swept-cavity
 * trace with known truth. FILE.csv has the columns time_s, ramp_V, transmission_V; FILE.truth.json beside it holds
 * the truth (TEM00 fraction, order shares, FSR, finesse, Gouy phase, every peak) and the options used, and
 * FILE.cavity.json the geometry in the analyze command's format.
 */
import { writeFileSync } from 'node:fs'
import { generateSweptTrace, simPresets, type SweptTrace, type SweptTraceOptions } from '../shared/sim'
import { parseCommandLine } from './parseCommandLine'
import { UsageError } from './usageError'

export const generateHelp = `Usage: cavitrace generate --preset NAME --out FILE.csv [--seed N] [--samples N]
       cavitrace generate --list

Writes a synthetic trace with known truth: FILE.csv, FILE.truth.json and FILE.cavity.json.
  --preset NAME   one of the presets that --list prints
  --seed N        noise draw (an integer)
  --samples N     the same sweep sampled finer or coarser (the record keeps its duration)
`

function integerOption(flag: string, text: string): number {
  const value = Number(text)
  if (!Number.isInteger(value)) throw new UsageError('bad_argument', `cavitrace generate: ${flag} must be an integer, got ${JSON.stringify(text)}.`)
  return value
}

export function generateCommand(args: string[]): number {
  const parsed = parseCommandLine('generate', args, {
    preset: { type: 'string' },
    out: { type: 'string' },
    seed: { type: 'string' },
    samples: { type: 'string' },
    list: { type: 'boolean' },
  }, generateHelp)
  if (parsed === null) return 0
  const { values, positionals } = parsed
  if (positionals.length > 0) throw new UsageError('bad_argument', `cavitrace generate takes no positional arguments (got ${JSON.stringify(positionals[0])}).`)
  if (values.list) {
    for (const [name, options] of Object.entries(simPresets)) {
      process.stdout.write(`${name}\t${options.sampleCount} samples, finesse ${options.finesse}, ${options.fsrCount} FSR\n`)
    }
    return 0
  }
  const name = values.preset
  if (name === undefined || !(name in simPresets)) throw new UsageError('bad_argument', `cavitrace generate: --preset must be one of: ${Object.keys(simPresets).join(', ')}.`)
  const out = values.out
  if (out === undefined || !out.endsWith('.csv')) throw new UsageError('bad_argument', 'cavitrace generate: --out must name a .csv file.')

  const options: SweptTraceOptions = { ...simPresets[name] }
  if (values.seed !== undefined) options.seed = integerOption('--seed', values.seed)
  if (values.samples !== undefined) {
    const sampleCount = integerOption('--samples', values.samples)
    if (sampleCount < 2) throw new UsageError('bad_argument', 'cavitrace generate: --samples must be at least 2.')
    options.sampleIntervalSeconds = ((options.sampleIntervalSeconds ?? 1e-5) * options.sampleCount) / sampleCount
    options.sampleCount = sampleCount
  }

  const trace = generateSweptTrace(options)
  writeFileSync(out, toCsv(trace))
  const truthPath = out.replace(/\.csv$/, '.truth.json')
  writeFileSync(truthPath, JSON.stringify({ preset: name, options, truth: trace.truth }, null, 2) + '\n')
  if (options.cavity) {
    const geometry = { ...options.cavity, ...(options.modulationMHz === undefined ? {} : { modulationMHz: options.modulationMHz }) }
    writeFileSync(out.replace(/\.csv$/, '.cavity.json'), JSON.stringify(geometry, null, 2) + '\n')
  }
  const { truth } = trace
  process.stdout.write(
    `${out}: ${trace.tSeconds.length} samples, TEM00 fraction ${truth.fundamentalFraction.toFixed(4)}, ` +
      `FSR ${truth.fsrSeconds.toPrecision(6)} s, ${truth.samplesPerLinewidth.toFixed(1)} samples per linewidth, ` +
      `${truth.peaks.length} peaks in the sweep; truth in ${truthPath}\n`,
  )
  return 0
}

/** CSV text, built in chunks so two million rows do not make one giant string concatenation chain. */
function toCsv(trace: SweptTrace): string {
  const { tSeconds, rampV, transmissionV } = trace
  const chunks: string[] = [rampV ? 'time_s,ramp_V,transmission_V' : 'time_s,transmission_V']
  let rows: string[] = []
  for (let i = 0; i < tSeconds.length; i++) {
    const t = Number(tSeconds[i].toPrecision(12))
    const v = Number(transmissionV[i].toPrecision(7))
    rows.push(rampV ? `${t},${Number(rampV[i].toPrecision(7))},${v}` : `${t},${v}`)
    if (rows.length === 65_536) {
      chunks.push(rows.join('\n'))
      rows = []
    }
  }
  if (rows.length > 0) chunks.push(rows.join('\n'))
  return chunks.join('\n') + '\n'
}
