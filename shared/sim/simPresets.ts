import { computeCavityModel, type CavityGeometry } from '../cavity'
import type { SweptTraceOptions } from './types'

/** Options with ψ taken from the geometry, so the preset stays consistent if someone drops `cavity`. */
function withCavity(cavity: CavityGeometry, rest: Omit<SweptTraceOptions, 'cavity' | 'gouyOneWayRad'>): SweptTraceOptions {
  return { cavity, gouyOneWayRad: computeCavityModel(cavity).gouyOneWayRad, ...rest }
}

/**
 * Named, realistic cases of an invented lab. Geometries are typical of each kind of cavity (common practice);
 * finesse is kept in the range a scope trace resolves. Each preset is a plain options object: spread it and
 * override fields to make variants.
 */
export const simPresets: Record<string, SweptTraceOptions> = {
  /** Plano-concave 1064 nm reference cavity, well matched, 12-bit scope, slight piezo nonlinearity. */
  'reference-1064': withCavity(
    { wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: 500 },
    {
      finesse: 3000,
      orderPowers: [0.86, 0.05, 0.06, 0.015, 0.01, 0.005],
      sampleCount: 200_000,
      fsrCount: 2.2,
      nonlinearity: 0.05,
      sampleIntervalSeconds: 5e-6,
      peakHeightV: 1.2,
      noiseFraction: 0.002,
      quantizationBits: 12,
      seed: 1064,
    },
  ),
  /** Symmetric 780 nm filter cavity with 20 MHz phase-modulation sidebands, 8-bit scope, detector low-pass. */
  'filter-780': withCavity(
    { wavelengthNm: 780, lengthMm: 200, roc1Mm: 1000, roc2Mm: 1000 },
    {
      finesse: 400,
      orderPowers: [0.72, 0.14, 0.1, 0.03, 0.01],
      sampleCount: 50_000,
      fsrCount: 2.5,
      nonlinearity: 0.12,
      sampleIntervalSeconds: 2e-5,
      peakHeightV: 0.45,
      noiseFraction: 0.004,
      quantizationBits: 8,
      darkOffsetV: 0.004,
      lowPassTauSeconds: 1e-5,
      modulationMHz: 20,
      sidebandPowerFraction: 0.08,
      seed: 780,
    },
  ),
  /** Near-concentric 532 nm enhancement cavity, poorly matched, triangle ramp sweeping down, drifting power. */
  'enhancement-532': withCavity(
    { wavelengthNm: 532, lengthMm: 60, roc1Mm: 50, roc2Mm: 50 },
    {
      finesse: 150,
      orderPowers: [0.58, 0.12, 0.2, 0.04, 0.04, 0.02],
      sampleCount: 20_000,
      fsrCount: 1.8,
      direction: 'down',
      rampShape: 'triangle',
      sweepFractionOfRecord: 0.5,
      nonlinearity: 0.15,
      sampleIntervalSeconds: 5e-5,
      peakHeightV: 2.5,
      noiseFraction: 0.005,
      driftFraction: 0.04,
      astigmatismSplitFsr: 0.003,
      seed: 532,
    },
  ),
  /** The 1064 nm reference cavity swept fast with a nanosecond-resolution scope: ring-down after every crossing. */
  'reference-1064-fast': withCavity(
    { wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: 500 },
    {
      finesse: 3000,
      orderPowers: [0.9, 0.06, 0.04],
      sampleCount: 200_000,
      fsrCount: 2.6,
      sampleIntervalSeconds: 2e-8,
      noiseFraction: 0.003,
      ringing: true,
      seed: 1065,
    },
  ),
}
