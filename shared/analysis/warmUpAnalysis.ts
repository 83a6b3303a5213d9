import { computeCavityModel, type CavityGeometry } from '../cavity'
import { generateSweptTrace } from '../sim'
import type { Trace } from '../trace/types'
import { analyzeTrace } from './analyzeTrace'

export interface WarmUpAnalysisOptions {
  /** Analyses of the small generated trace. @default 10 */
  rounds?: number
  /** Samples of the generated trace. @default 20000 */
  sampleCount?: number
}

/**
 * Analyses a small generated trace a few times so that the JavaScript engine compiles the analysis's hot loops
 * before the first real upload: a cold process spends about twice the CPU time on its first analysis. Meant for a
 * worker thread or process at start; it returns the number of analyses run. Pure: no I/O, nothing kept.
 */
export function warmUpAnalysis(options: WarmUpAnalysisOptions = {}): number {
  const { rounds = 10, sampleCount = 20_000 } = options
  const cavity: CavityGeometry = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: 500 }
  const sim = generateSweptTrace({
    cavity,
    gouyOneWayRad: computeCavityModel(cavity).gouyOneWayRad,
    finesse: 1000,
    orderPowers: [0.85, 0.08, 0.05, 0.02],
    sampleCount,
    fsrCount: 3.2,
    nonlinearity: 0.05,
    noiseFraction: 0.003,
    seed: 7,
  })
  const trace: Trace = {
    sampleCount,
    sampleInterval: sim.sampleIntervalSeconds,
    startTime: sim.tSeconds[0],
    time: sim.tSeconds,
    channels: [
      { name: 'transmission', unit: 'V', values: sim.transmissionV, role: 'transmission', roleEvidence: 'generated' },
      { name: 'ramp', unit: 'V', values: sim.rampV!, role: 'ramp', roleEvidence: 'generated' },
    ],
    metadata: {},
    warnings: [],
  }
  for (let round = 0; round < rounds; round++) analyzeTrace(trace, cavity)
  return rounds
}
