import { describe, expect, it } from 'vitest'
import { EngineError } from '../../../shared/errors'
import { foldFastStructure, type StructurePeak } from '../../../shared/peaks/foldFastStructure'
import { generateSweptTrace, type CavityGeometry, type SweptTrace, type SweptTraceOptions } from '../../../shared/sim'
import { resonancesFromSim } from './resonancesFromSim'

// 1064 nm, 100 mm, flat / 500 mm: FSR 1.499 GHz (c / 2L), orders ψ/π = 0.148 FSR apart (Siegman, "Lasers" (1986),
// ch. 19). Finesse 3000 over 3.5 FSR of 54,000 µs-samples: a linewidth is 5.1 µs on the time axis.
const cavity: CavityGeometry = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: 500 }
const base: SweptTraceOptions = {
  cavity,
  gouyOneWayRad: 0,
  finesse: 3000,
  orderPowers: [0.5, 0.25, 0.15, 0.07, 0.03],
  sampleCount: 60_000,
  sampleIntervalSeconds: 1e-6,
  fsrCount: 3.5,
  noiseFraction: 0.003,
}
const SEEDS = [1, 2, 3, 4, 5]

/** A hand-made peak (seconds, volts); width 1 s unless given. */
const peak = (tSeconds: number, heightV: number, widthSeconds = 1): StructurePeak => ({ tSeconds, heightV, widthSeconds })

/** The found peak nearest each true resonance of the main sweep within 1.5 linewidths (the ringing delays a top by ~0.5). */
function matchTruth(sim: SweptTrace, peaks: StructurePeak[]): Map<number, SweptTrace['truth']['peaks'][number]> {
  const linewidthSeconds = sim.truth.fsrSeconds / sim.truth.finesse
  const matched = new Map<number, SweptTrace['truth']['peaks'][number]>()
  for (const truth of sim.truth.peaks) {
    let best = -1
    peaks.forEach((p, i) => {
      const off = Math.abs(p.tSeconds - truth.t)
      if (off < 1.5 * linewidthSeconds && (best < 0 || off < Math.abs(peaks[best].tSeconds - truth.t))) best = i
    })
    if (best >= 0) matched.set(best, truth)
  }
  return matched
}

describe('foldFastStructure on hand-made peak lists', () => {
  // Resonances of three heights (FWHM 4 s), each followed by lobes 10 s apart (FWHM 2 s: half-cycles) falling by 0.6
  // per period; the first lobe comes a little late, as the owner's own top is delayed by the response.
  const rings = (t: number, h: number) => [peak(t, h, 4), peak(t + 10.6, 0.55 * h, 2), peak(t + 20.6, 0.33 * h, 2), peak(t + 30.6, 0.2 * h, 2)]
  const ringing = [...rings(0, 1), ...rings(400, 0.5), ...rings(900, 0.3), ...rings(1300, 1)]

  it('when each resonance is followed by falling lobes at one spacing then every lobe is folded into its resonance', () => {
    const found = foldFastStructure(ringing, { sigmaV: 0.002 })
    expect(found.kind).toBe('ringing')
    expect(found.periodSeconds).toBeCloseTo(10, 6)
    const expected = new Map<number, number>()
    for (let owner = 0; owner < ringing.length; owner += 4) for (let j = 1; j <= 3; j++) expected.set(owner + j, owner)
    expect(found.ownerOf).toEqual(expected)
  })

  it('when the same list comes shuffled then the owners are the same peaks, by input index', () => {
    const order = ringing.map((_, i) => i).reverse()
    const found = foldFastStructure(order.map((i) => ringing[i]), { sigmaV: 0.002 })
    const back = new Map([...found.ownerOf].map(([lobe, owner]) => [order[lobe], order[owner]]))
    expect(back.size).toBe(12)
    for (const [lobe, owner] of back) expect(owner).toBe(lobe - (lobe % 4))
  })

  it('when a matching peak also precedes each resonance (sidebands) then nothing is folded', () => {
    const carriers: [number, number][] = [[0, 1], [400, 0.5], [900, 0.3], [1300, 1]]
    const sidebands = carriers.flatMap(([t, h]) => [peak(t - 10.6, 0.4 * h, 2), peak(t, h, 4), peak(t + 10.6, 0.4 * h, 2)])
    expect(foldFastStructure(sidebands, { sigmaV: 0.002 })).toEqual({ ownerOf: new Map(), periodSeconds: null, kind: null })
  })

  it('when the neighbours at one spacing are about as tall (split lines) then nothing is folded', () => {
    const orders: [number, number][] = [[0, 0.5], [400, 0.3], [900, 0.5], [1300, 0.3]]
    const split = orders.flatMap(([t, h]) => [peak(t, h, 2), peak(t + 10, 0.94 * h, 2), peak(t + 20, 0.9 * h, 2)])
    expect(foldFastStructure(split, { sigmaV: 0.002 }).ownerOf.size).toBe(0)
  })

  it('when equal resonances are each followed by lines of their own width at one spacing (a transverse ladder) then nothing is folded', () => {
    const ladder = [0, 1000, 2000, 3000].flatMap((t) => [peak(t, 1, 4), peak(t + 20, 0.5, 4), peak(t + 40, 0.24, 4), peak(t + 60, 0.14, 4)])
    expect(foldFastStructure(ladder, { sigmaV: 0.002 }).ownerOf.size).toBe(0)
  })

  it('when the followers are lines far narrower than a half-cycle of their spacing then nothing is folded', () => {
    // FWHM 0.3 s at a 10 s spacing: 0.03 of the period, where a ringing lobe is about a fifth of it.
    const lines = [0, 400, 900, 1300].flatMap((t, k) => [peak(t, [1, 0.5, 0.3, 1][k]), peak(t + 10, 0.5, 0.3), peak(t + 20, 0.3, 0.3), peak(t + 30, 0.18, 0.3)])
    expect(foldFastStructure(lines, { sigmaV: 0.002 }).ownerOf.size).toBe(0)
  })

  it('when weak peaks fall at one spacing by less than the noise could make them fall then nothing is folded', () => {
    // σ = 3 mV: each first step is 3–4 mV, about 1 σ.
    const weak = [0, 400, 900, 1300].flatMap((t, k) => {
      const h = [0.015, 0.02, 0.018, 0.016][k]
      return [peak(t, h, 4), peak(t + 10, 0.8 * h, 2), peak(t + 20, 0.64 * h, 2)]
    })
    expect(foldFastStructure(weak, { sigmaV: 0.003 }).ownerOf.size).toBe(0)
    // The same shapes 20× taller stand well out of the noise and are folded.
    expect(foldFastStructure(weak.map((p) => ({ ...p, heightV: 20 * p.heightV })), { sigmaV: 0.003 }).ownerOf.size).toBe(8)
  })

  it('when a peak has no finite time then the input is refused with the peak named', () => {
    const call = () => foldFastStructure([peak(0, 1), peak(Number.NaN, 1)])
    expect(call).toThrow(EngineError)
    expect(call).toThrow('peak 1 must have finite tSeconds, heightV and widthSeconds')
  })
})

describe('foldFastStructure on resonances found in generated traces', () => {
  // Ringing periods of 3.0 and 2.4 linewidths, decaying over 2 and 3 periods (the finder merges faster ringing into
  // its resonance, so no lobes are listed to fold).
  const ringings = [
    { ringHz: 65e3, decayPeriods: 2 },
    { ringHz: 80e3, decayPeriods: 3 },
  ]
  const cases = ringings.flatMap((r) => [true, false].map((includeRamp) => ({ ...r, includeRamp })))

  it.each(cases)('when a detector rings at $ringHz Hz for $decayPeriods periods (ramp channel: $includeRamp) then every lobe gets the resonance it follows as owner and no resonance is folded', ({ ringHz, decayPeriods, includeRamp }) => {
    const periodSeconds = 1 / ringHz
    const reachSeconds = 6 * decayPeriods * periodSeconds + periodSeconds
    let lobesSeen = 0
    let lobesFolded = 0
    for (const seed of SEEDS) {
      const sim = generateSweptTrace({ ...base, seed, includeRamp, detectorRingHz: ringHz, detectorRingDecaySeconds: decayPeriods * periodSeconds })
      const { peaks, sigmaV } = resonancesFromSim(sim)
      const found = foldFastStructure(peaks, { sigmaV })
      expect(found.kind).toBe('ringing')
      expect(Math.abs(found.periodSeconds! / periodSeconds - 1)).toBeLessThan(0.01)
      const truthOf = matchTruth(sim, peaks)
      const tallest = Math.max(...sim.truth.peaks.map((p) => p.heightV))
      const inSweep = (p: StructurePeak) => p.tSeconds >= sim.truth.sweepStartSeconds && p.tSeconds <= sim.truth.sweepEndSeconds
      peaks.forEach((p, i) => {
        if (!inSweep(p)) return // no truth is listed for the flyback
        const truth = truthOf.get(i)
        if (truth) {
          if (truth.heightV >= 0.05 * tallest) expect(found.ownerOf.has(i)).toBe(false)
          return
        }
        // Not a resonance: it must be a lobe, after a true resonance within the ringing's reach, owned by it.
        lobesSeen++
        const owner = found.ownerOf.get(i)
        if (owner === undefined) return
        lobesFolded++
        const ownerTruth = truthOf.get(owner)
        expect(ownerTruth).toBeDefined()
        expect(p.tSeconds - ownerTruth!.t).toBeGreaterThan(0)
        expect(p.tSeconds - ownerTruth!.t).toBeLessThan(reachSeconds)
      })
    }
    expect(lobesSeen).toBeGreaterThan(300)
    expect(lobesFolded / lobesSeen).toBeGreaterThan(0.98)
  })

  it.each([true, false])('when the lines are clean (ramp channel: %s) then nothing is folded', (includeRamp) => {
    for (const seed of SEEDS) {
      const { peaks, sigmaV } = resonancesFromSim(generateSweptTrace({ ...base, seed, includeRamp }))
      expect(peaks.length).toBeGreaterThan(10)
      expect(foldFastStructure(peaks, { sigmaV })).toEqual({ ownerOf: new Map(), periodSeconds: null, kind: null })
    }
  })

  it.each([
    { modulationMHz: 2, sidebandPowerFraction: 0.2 },
    { modulationMHz: 1.5, sidebandPowerFraction: 0.3 },
  ])('when phase-modulation sidebands sit $modulationMHz MHz (3–4 linewidths) on both sides of every carrier then nothing is folded', (modulation) => {
    for (const seed of SEEDS) {
      const { peaks, sigmaV } = resonancesFromSim(generateSweptTrace({ ...base, ...modulation, seed }))
      expect(peaks.length).toBeGreaterThan(30)
      expect(foldFastStructure(peaks, { sigmaV }).ownerOf.size).toBe(0)
    }
  })

  it.each([0.001, 0.0017])('when astigmatism splits the orders by %s FSR (3 and 5 linewidths) then nothing is folded', (astigmatismSplitFsr) => {
    for (const seed of SEEDS) {
      const { peaks, sigmaV } = resonancesFromSim(generateSweptTrace({ ...base, astigmatismSplitFsr, seed }))
      expect(peaks.length).toBeGreaterThan(30)
      expect(foldFastStructure(peaks, { sigmaV }).ownerOf.size).toBe(0)
    }
  })

  it('when a near-planar cavity puts falling orders 0.02 FSR (6 linewidths) after each TEM00 then nothing is folded', () => {
    const { cavity: _omit, ...withoutCavity } = base
    void _omit
    for (const seed of SEEDS) {
      const sim = generateSweptTrace({ ...withoutCavity, gouyOneWayRad: 0.02 * Math.PI, finesse: 300, orderPowers: [0.5, 0.25, 0.12, 0.07, 0.04, 0.02], seed })
      const { peaks, sigmaV } = resonancesFromSim(sim)
      expect(peaks.length).toBeGreaterThan(12)
      expect(foldFastStructure(peaks, { sigmaV }).ownerOf.size).toBe(0)
    }
  })
})
