/** Exports the benchmarks analyse: generated two-channel traces written as a scope prints them (time, transmission, ramp). */
import { generateSweptTrace, simPresets } from '../../shared/sim'

export const benchPreset = simPresets['reference-1064']

/** CSV bytes of three columns with exponent notation, the layout the analysis benchmarks read. */
export function csvOf(t: Float64Array, a: Float64Array, b: Float64Array): Uint8Array {
  const lines = ['time,transmission,ramp']
  for (let i = 0; i < t.length; i++) lines.push(`${t[i].toExponential(7)},${a[i].toExponential(5)},${b[i].toExponential(5)}`)
  return new TextEncoder().encode(lines.join('\n'))
}

/** The benchmark export of `sampleCount` samples: the same sweep sampled finer or coarser (seed varies the noise). */
export function benchExport(sampleCount: number, seed?: number): Uint8Array {
  const sim = generateSweptTrace({ ...benchPreset, sampleCount, sampleIntervalSeconds: 1e-6 * (200_000 / sampleCount) * 5, ...(seed === undefined ? {} : { seed }) })
  return csvOf(sim.tSeconds, sim.transmissionV, sim.rampV!)
}
