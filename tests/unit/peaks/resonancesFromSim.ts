import { findAllResonances } from '../../../shared/peaks/findAllResonances'
import { prepareSignal, type PreparedSignal } from '../../../shared/peaks/prepareSignal'
import { tallResonances } from '../../../shared/peaks/tallResonances'
import type { StructurePeak } from '../../../shared/peaks/foldFastStructure'
import type { SweptTrace } from '../../../shared/sim'
import { findSweepInData } from '../../../shared/sweep/findSweepInData'
import { selectSweep } from '../../../shared/sweep/selectSweep'

/**
 * The resonances the pipeline finds in a generated trace, as analyzeTrace's steps 1–4 find them (sweep part, baseline
 * and noise, tall resonances for the linewidth, then every resonance at half-linewidth smoothing, measured), on the
 * trace's own time axis, with the noise σ of the selected part.
 */
export function resonancesFromSim(sim: SweptTrace): { peaks: StructurePeak[]; sigmaV: number } {
  const values = Float64Array.from(sim.transmissionV)
  const n = values.length
  const dt = sim.sampleIntervalSeconds
  let sweep = selectSweep(sim.rampV, n)
  let whole: PreparedSignal | null = null
  if (!sim.rampV) {
    whole = prepareSignal(values)
    sweep = findSweepInData(tallResonances(whole.signal, whole.sigmaV), n)
  }
  const { signal, sigmaV } = whole
    ? { ...whole, signal: whole.signal.subarray(sweep.startIndex, sweep.endIndex) }
    : prepareSignal(values.subarray(sweep.startIndex, sweep.endIndex))
  const { measured } = findAllResonances(signal, sigmaV)
  const startSeconds = sim.tSeconds[0] + sweep.startIndex * dt
  return {
    peaks: measured.map((m) => ({
      tSeconds: startSeconds + m.centerIndex * dt,
      heightV: m.heightV,
      widthSeconds: m.fwhmSamples * dt,
      areaVSeconds: m.areaVSamples * dt,
    })),
    sigmaV,
  }
}
