/**
 * Writes a synthetic swept-cavity trace for demos and manual tries:
 *
 *   npx tsx scripts/generate.ts --preset NAME --out FILE.csv [--seed N] [--samples N (same record length)]
 *   npx tsx scripts/generate.ts --list
 *
 * FILE.csv has the columns time_s, ramp_V, transmission_V; FILE.truth.json beside it holds the truth
 * (TEM00 fraction, order shares, FSR, finesse, Gouy phase, every peak) and the options used, and
 * FILE.cavity.json the geometry (with the modulation frequency, if any) in the analyze command's format.
 * On bad input it exits non-zero and prints {"error": {"code", "message"}}.
 */
import { writeFileSync } from 'node:fs'
import { parseArgs } from 'node:util'
import { isEngineError } from '../shared/errors'
import { generateSweptTrace, simPresets, type SweptTrace, type SweptTraceOptions } from '../shared/sim'

class UsageError extends Error {}

function main(argv: string[]): void {
  const { values } = parseArgs({
    args: argv,
    options: {
      preset: { type: 'string' },
      out: { type: 'string' },
      seed: { type: 'string' },
      samples: { type: 'string' },
      list: { type: 'boolean' },
    },
    strict: true,
  })
  if (values.list) {
    for (const [name, options] of Object.entries(simPresets)) {
      console.log(`${name}\t${options.sampleCount} samples, finesse ${options.finesse}, ${options.fsrCount} FSR`)
    }
    return
  }
  const name = values.preset
  if (name === undefined || !(name in simPresets)) {
    throw new UsageError(`--preset must be one of: ${Object.keys(simPresets).join(', ')}`)
  }
  const out = values.out
  if (out === undefined || !out.endsWith('.csv')) throw new UsageError('--out must name a .csv file')

  const options: SweptTraceOptions = { ...simPresets[name] }
  if (values.seed !== undefined) options.seed = integerArgument('--seed', values.seed)
  if (values.samples !== undefined) {
    // Same sweep, sampled finer or coarser: the record keeps its duration.
    const sampleCount = integerArgument('--samples', values.samples)
    options.sampleIntervalSeconds = ((options.sampleIntervalSeconds ?? 1e-5) * options.sampleCount) / sampleCount
    options.sampleCount = sampleCount
  }

  const trace = generateSweptTrace(options)
  writeFileSync(out, toCsv(trace))
  const truthPath = out.replace(/\.csv$/, '.truth.json')
  writeFileSync(truthPath, JSON.stringify({ preset: name, options, truth: trace.truth }, null, 2) + '\n')
  if (options.cavity) {
    // Ready for the analyze command: npm run analyze -- FILE.csv --cavity FILE.cavity.json
    const cavityPath = out.replace(/\.csv$/, '.cavity.json')
    const geometry = { ...options.cavity, ...(options.modulationMHz === undefined ? {} : { modulationMHz: options.modulationMHz }) }
    writeFileSync(cavityPath, JSON.stringify(geometry, null, 2) + '\n')
  }
  const { truth } = trace
  console.log(
    `${out}: ${trace.tSeconds.length} samples, TEM00 fraction ${truth.fundamentalFraction.toFixed(4)}, ` +
      `FSR ${truth.fsrSeconds.toPrecision(6)} s, ${truth.samplesPerLinewidth.toFixed(1)} samples per linewidth, ` +
      `${truth.peaks.length} peaks in the sweep; truth in ${truthPath}`,
  )
}

function integerArgument(flag: string, text: string): number {
  const value = Number(text)
  if (!Number.isInteger(value)) throw new UsageError(`${flag} must be an integer, got ${text}`)
  return value
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

try {
  main(process.argv.slice(2))
} catch (error) {
  const known = isEngineError(error) || error instanceof UsageError || (error as { code?: string }).code?.startsWith('ERR_PARSE_ARGS')
  if (!known) throw error
  const code = isEngineError(error) ? error.code : 'usage'
  console.error(JSON.stringify({ error: { code, message: (error as Error).message } }))
  process.exitCode = 1
}
