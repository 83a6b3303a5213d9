/**
 * The invented demo lab's cavities, each with a few weeks of generated scope traces and their
 * analyses (run here with the real engine), so the first `npm start` shows a living app. The traces
 * come from the project's own generator; the people and cavities are invented.
 */
import { createHash } from 'node:crypto'
import { gzipSync } from 'node:zlib'
import type { Knex } from 'knex'
import { analyzeTrace } from '../../shared/analysis/analyzeTrace'
import type { CavityInput } from '../../shared/api/cavitySchemas'
import type { CavityGeometry } from '../../shared/cavity'
import { isEngineError } from '../../shared/errors'
import { formatSweptTraceCsv } from '../../shared/sim/formatSweptTraceCsv'
import { generateSweptTrace } from '../../shared/sim/generateSweptTrace'
import { simPresets } from '../../shared/sim/simPresets'
import type { SweptTraceOptions } from '../../shared/sim/types'
import { readTrace } from '../../shared/trace/readTrace'

const DAY_MS = 86_400_000

interface DemoCavity {
  input: CavityInput
  preset: SweptTraceOptions
  /** TEM00 fraction of each scan, oldest first: a tuning story. */
  fractions: number[]
  /** Finesse of each scan (dirty mirrors show as a slow fall). */
  finesse: (index: number) => number
  notes: string[]
  uploader: string
}

const demoCavities: DemoCavity[] = [
  {
    input: {
      name: 'REF-1064 reference cavity',
      description: 'Plano-concave reference cavity for the 1064 nm laser lock; ULE spacer in a vacuum can.',
      location: 'Room B12, table 1',
      wavelengthNm: 1064,
      lengthMm: 100,
      roc1Mm: null,
      roc2Mm: 500,
      reflectivity1: 0.999,
      reflectivity2: 0.999,
      targetFundamentalFraction: 0.9,
      archived: false,
    },
    preset: { ...simPresets['reference-1064'], sampleCount: 40_000, sampleIntervalSeconds: 2.5e-5 },
    fractions: [0.71, 0.76, 0.8, 0.79, 0.84, 0.87, 0.88, 0.91, 0.92, 0.92],
    finesse: () => 3000,
    notes: ['first scan after moving the cavity', 'walked the beam with M3/M4', 'lens L2 +2 mm', 'lens L2 +1 mm (overshot)', 'lens L1 −1 mm', 'tilt on M4', 'lens L2 +0.5 mm', 'walked the beam again', 'check after lunch', 'weekly check'],
    uploader: 'experimenter@demo.cavitrace.test',
  },
  {
    input: {
      name: 'FLT-780 filter cavity',
      description: 'Symmetric filter cavity cleaning the 780 nm beam before the fibre; 20 MHz phase modulation for the lock.',
      location: 'Room B12, table 3',
      wavelengthNm: 780,
      lengthMm: 200,
      roc1Mm: 1000,
      roc2Mm: 1000,
      reflectivity1: 0.992,
      reflectivity2: 0.992,
      modulationMHz: 20,
      targetFundamentalFraction: 0.8,
      archived: false,
    },
    preset: { ...simPresets['filter-780'], sampleCount: 40_000 },
    fractions: [0.82, 0.81, 0.8, 0.79, 0.77, 0.75, 0.74, 0.8, 0.83, 0.84],
    // The mirrors collect dust: finesse falls until the cleaning after scan 7.
    finesse: (index) => (index < 7 ? 400 - 22 * index : 395),
    notes: ['routine check', 'routine check', 'after the table was bumped', 'routine check', 'finesse looks low', 'beam pointing drift?', 'before cleaning', 'after cleaning both mirrors', 'realigned after cleaning', 'routine check'],
    uploader: 'technician@demo.cavitrace.test',
  },
  {
    input: {
      name: 'SHG-532 enhancement cavity',
      description: 'Near-concentric enhancement cavity around the doubling crystal (532 nm output).',
      location: 'Room B14, table 2',
      wavelengthNm: 532,
      lengthMm: 60,
      roc1Mm: 50,
      roc2Mm: 50,
      targetFundamentalFraction: 0.7,
      archived: false,
    },
    // The scope shows a bit more than three FSRs per half of the triangle, so every sweep holds several TEM00.
    preset: { ...simPresets['enhancement-532'], fsrCount: 3.2 },
    fractions: [0.48, 0.53, 0.58, 0.61, 0.6, 0.65, 0.67, 0.69],
    finesse: () => 150,
    notes: ['crystal re-mounted', 'lens pair moved together +3 mm', 'focus lens +1 mm', 'walked in', 'focus lens −0.5 mm', 'second lens +1 mm', 'tilt', 'end of the day'],
    uploader: 'experimenter@demo.cavitrace.test',
  },
]

/** Split the non-TEM00 power over orders 1.. the way the preset does, scaled to the wanted fraction. */
function orderPowersFor(preset: SweptTraceOptions, fraction: number): number[] {
  const rest = preset.orderPowers.slice(1)
  const restSum = rest.reduce((sum, p) => sum + p, 0)
  return [fraction, ...rest.map((p) => ((1 - fraction) * p) / restSum)]
}

function geometryOf(input: CavityInput): CavityGeometry {
  const { wavelengthNm, lengthMm, roc1Mm, roc2Mm, reflectivity1, reflectivity2, modulationMHz } = input
  return { wavelengthNm, lengthMm, roc1Mm, roc2Mm, reflectivity1, reflectivity2, modulationMHz }
}

export async function seedDemoLab(knex: Knex, options: { now?: Date } = {}): Promise<number> {
  const now = options.now?.getTime() ?? Date.now()
  let created = 0
  for (const demo of demoCavities) {
    const existing = await knex('cavities').where({ name: demo.input.name }).first('id')
    if (existing) continue
    const uploader = await knex('users').where({ email: demo.uploader }).first('id')
    const geometry = geometryOf(demo.input)
    const [cavity] = await knex('cavities')
      .insert({
        name: demo.input.name,
        description: demo.input.description,
        location: demo.input.location,
        wavelength_nm: demo.input.wavelengthNm,
        length_mm: demo.input.lengthMm,
        roc1_mm: demo.input.roc1Mm,
        roc2_mm: demo.input.roc2Mm,
        reflectivity1: demo.input.reflectivity1 ?? null,
        reflectivity2: demo.input.reflectivity2 ?? null,
        modulation_mhz: demo.input.modulationMHz ?? null,
        target_fundamental_fraction: demo.input.targetFundamentalFraction,
        created_at: new Date(now - 30 * DAY_MS),
      })
      .returning('id')
    created += 1

    for (let index = 0; index < demo.fractions.length; index++) {
      // Scans spread over the last four weeks, a couple of days apart, in working hours.
      const at = new Date(now - (28 - Math.round((index * 27) / demo.fractions.length)) * DAY_MS + 10 * 3_600_000 + index * 1_800_000)
      const simulated = generateSweptTrace({
        ...demo.preset,
        cavity: geometry,
        finesse: demo.finesse(index),
        orderPowers: orderPowersFor(demo.preset, demo.fractions[index]),
        seed: (demo.preset.seed ?? 1) * 100 + index,
      })
      const csv = formatSweptTraceCsv(simulated, { layout: 'preamble-header', significantDigits: 6, metadata: { Source: 'demo generator', Note: demo.notes[index] } })
      const bytes = Buffer.from(csv)
      const [trace] = await knex('traces')
        .insert({
          cavity_id: cavity.id,
          sha256: createHash('sha256').update(bytes).digest('hex'),
          file_name: `scan-${String(index + 1).padStart(3, '0')}.csv`,
          size_bytes: bytes.length,
          content_gzip: gzipSync(bytes),
          note: demo.notes[index],
          uploaded_by: uploader?.id ?? null,
          uploaded_at: at,
        })
        .returning('id')

      const started = performance.now()
      let outcome: { result: ReturnType<typeof analyzeTrace> } | { error: { code: string; message: string } }
      try {
        outcome = { result: analyzeTrace(readTrace(bytes), geometry) }
      } catch (error) {
        if (!isEngineError(error)) throw error
        outcome = { error: { code: error.code, message: error.message } }
      }
      const result = 'result' in outcome ? outcome.result : null
      await knex('analyses').insert({
        trace_id: trace.id,
        cavity_id: cavity.id,
        status: result ? 'done' : 'failed',
        options: '{}',
        geometry: JSON.stringify(geometry),
        result: result ? JSON.stringify(result) : null,
        error: 'error' in outcome ? JSON.stringify(outcome.error) : null,
        fundamental_fraction: result?.fundamentalFraction ?? null,
        finesse: result?.finesse ?? null,
        linewidth_hz: result?.linewidthHz ?? null,
        attempts: 1,
        engine_ms: performance.now() - started,
        requested_by: uploader?.id ?? null,
        created_at: at,
        started_at: at,
        finished_at: at,
      })
    }
  }
  return created
}
