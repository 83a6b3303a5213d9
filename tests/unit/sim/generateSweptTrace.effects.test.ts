import { describe, expect, it } from 'vitest'
import { generateSweptTrace, type SweptTraceOptions } from '../../../shared/sim'
import { amplitudeAt, areaBetween, argMax, countLocalMaxima, indexAt, refinedPeakTime } from './helpers'

const clean: SweptTraceOptions = {
  gouyOneWayRad: 0.9,
  finesse: 1000,
  orderPowers: [1],
  sampleCount: 100_000,
  fsrCount: 1.2,
  startDetuningFsr: 0.5,
  noiseFraction: 0,
  darkOffsetV: 0,
  seed: 5,
}

describe('generateSweptTrace sidebands, split orders and dither', () => {
  it('when the laser is phase modulated then sidebands sit ±f_mod/FSR_Hz FSR from each carrier with their power', () => {
    const fsrHz = 1e9
    const trace = generateSweptTrace({ ...clean, orderPowers: [0.8, 0.2], fsrHz, modulationMHz: 40, sidebandPowerFraction: 0.1 })
    const { truth, tSeconds, transmissionV, sampleIntervalSeconds } = trace
    const carrier = truth.peaks.find((p) => p.kind === 'carrier' && p.order === 0)!
    const sidebands = truth.peaks.filter((p) => p.kind === 'sideband' && p.order === 0)
    // Sidebands are excluded from the order shares.
    expect(truth.orderShares).toEqual([0.8, 0.2])
    const offsets = sidebands.map((p) => (p.t - carrier.t) / truth.fsrSeconds).sort((a, b) => a - b)
    // 40 MHz / 1 GHz = 0.04 FSR on either side (first-order phase-modulation sidebands; common practice).
    expect(offsets[0]).toBeCloseTo(-0.04, 9)
    expect(offsets[offsets.length - 1]).toBeCloseTo(0.04, 9)
    for (const sideband of sidebands) {
      expect(sideband.power).toBeCloseTo(0.08, 12)
      expect(sideband.heightV).toBeCloseTo(0.1, 12)
      const top = argMax(transmissionV, indexAt(tSeconds, sideband.t) - 30, indexAt(tSeconds, sideband.t) + 30)
      expect(Math.abs(refinedPeakTime(tSeconds, transmissionV, top) - sideband.t)).toBeLessThan(0.2 * sampleIntervalSeconds)
      // 40 linewidths from the carrier its wing adds ≈ 1.6e-4 V.
      expect(transmissionV[top]).toBeCloseTo(0.1, 3)
    }
  })

  it('when a modulation frequency is given without an FSR in Hz then it is refused', () => {
    expect(() => generateSweptTrace({ ...clean, modulationMHz: 20 })).toThrow(/modulationMHz needs the FSR in Hz/)
  })

  it('when orders are split then order N shows N + 1 sub-peaks Δ apart (N·Δ end to end), sharing its power', () => {
    const { truth } = generateSweptTrace({ ...clean, orderPowers: [0.6, 0.1, 0.3], astigmatismSplitFsr: 0.02 })
    const t0 = truth.peaks.find((p) => p.order === 0)!.t
    const within = (order: number) => truth.peaks.filter((p) => p.order === order && p.t > t0 && p.t < t0 + truth.fsrSeconds)
    const first = within(1)
    const second = within(2)
    expect(first).toHaveLength(2)
    expect(second).toHaveLength(3)
    // HG_mn at (m − n)·Δ/2 about the order's mean place (Siegman, "Lasers" (1986), ch. 20).
    expect((first[1].t - first[0].t) / truth.fsrSeconds).toBeCloseTo(0.02, 9)
    expect((second[2].t - second[0].t) / truth.fsrSeconds).toBeCloseTo(0.04, 9)
    // Centred on 2ψ/π mod 1 (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)).
    expect((second[1].t - t0) / truth.fsrSeconds).toBeCloseTo((2 * 0.9) / Math.PI, 9)
    expect(second.reduce((sum, p) => sum + p.power, 0)).toBeCloseTo(0.3, 12)
    expect(truth.peaks.filter((p) => p.order === 0).every((p) => p.power === 0.6)).toBe(true)
  })

  it('when the laser frequency is dithered then the transmission on a peak flank oscillates at the dither frequency', () => {
    // Linewidth = fsrSeconds/𝓕 = 0.18 s/1.2/200 = 750 µs: a 20 kHz dither makes 15 cycles across it (50 samples each).
    const options = { ...clean, finesse: 200, sampleIntervalSeconds: 1e-6, sampleCount: 200_000 }
    const ditherFrequencyHz = 20_000
    const plain = generateSweptTrace(options)
    const dithered = generateSweptTrace({ ...options, ditherAmplitudeFsr: 0.2 / 200, ditherFrequencyHz })
    const peak = plain.truth.peaks[0]
    const linewidthSeconds = plain.truth.fsrSeconds / 200
    // One linewidth on the rising flank, centred half a linewidth before the peak (where the slope is steepest).
    const from = indexAt(plain.tSeconds, peak.t - linewidthSeconds)
    const to = indexAt(plain.tSeconds, peak.t)
    const dt = plain.sampleIntervalSeconds
    const atDither = amplitudeAt(dithered.transmissionV, dt, from, to, ditherFrequencyHz)
    const offDither = amplitudeAt(dithered.transmissionV, dt, from, to, 0.63 * ditherFrequencyHz)
    const withoutDither = amplitudeAt(plain.transmissionV, dt, from, to, ditherFrequencyHz)
    // Lorentzian slope at the half-width point: |dT/dx| = 0.5 H per half-width, so ±0.2 linewidth gives ≈ 0.2 H.
    expect(atDither).toBeGreaterThan(0.1)
    expect(atDither).toBeLessThan(0.3)
    expect(offDither).toBeLessThan(0.1 * atDither)
    expect(withoutDither).toBeLessThan(0.01 * atDither)
  })
})

describe('generateSweptTrace cavity ringing', () => {
  // 100 mm cavity: FSR = c/2L = 1.49896229 GHz (Siegman, "Lasers" (1986), ch. 11); 𝓕 = 3000 → δν ≈ 500 kHz,
  // amplitude decay time τ = 1/(π δν) ≈ 637 ns (OPTICS-CHECKS 2(c): energy time 1/(2π δν)).
  const fsrHz = 1.49896229e9
  const finesse = 3000
  const tau = 1 / (Math.PI * (fsrHz / finesse))
  /** A sweep of `speed` = π·rate·τ² (linewidths swept per decay time / π) with 21 samples per linewidth. */
  const sweepAt = (speed: number): SweptTraceOptions => {
    const rateHzPerSecond = speed / (Math.PI * tau * tau)
    const fsrSeconds = fsrHz / rateHzPerSecond
    const linewidthSeconds = fsrSeconds / finesse
    return { ...clean, fsrHz, finesse, sampleIntervalSeconds: linewidthSeconds / 21, sampleCount: Math.round((1.2 * finesse * 21) / 0.9) }
  }

  it('when the sweep crosses a resonance fast then the transmission rings after the peak and the peak is lower', () => {
    const options = sweepAt(3)
    const ringing = generateSweptTrace({ ...options, ringing: true })
    const steady = generateSweptTrace(options)
    const { tSeconds, transmissionV, truth } = ringing
    const i = indexAt(tSeconds, truth.peaks[0].t)
    const top = argMax(transmissionV, i - 200, i + 400)
    // Ring-down beats after a fast crossing (Poirson et al., J. Opt. Soc. Am. B 14, 2811 (1997)).
    const end = indexAt(tSeconds, tSeconds[top] + 8 * tau)
    expect(countLocalMaxima(transmissionV, top, end, 0.01)).toBeGreaterThanOrEqual(3)
    expect(countLocalMaxima(steady.transmissionV, top, end, 0.001)).toBe(0)
    expect(transmissionV[top]).toBeLessThan(0.9)
    // The maximum comes after the resonance time: the field needs time to build up.
    expect(tSeconds[top]).toBeGreaterThan(truth.peaks[0].t)
    // Transmitted energy of a linear chirp through a Lorentzian does not depend on the speed (Parseval's theorem
    // with the flat spectrum of a linear chirp; derived here).
    const half = Math.round((0.3 * truth.fsrSeconds) / ringing.sampleIntervalSeconds)
    const dynamicArea = areaBetween(transmissionV, ringing.sampleIntervalSeconds, i - half, i + half)
    const steadyArea = areaBetween(steady.transmissionV, ringing.sampleIntervalSeconds, i - half, i + half)
    expect(dynamicArea / steadyArea).toBeCloseTo(1, 2)
  })

  it('when the sweep is slow then ringing changes nothing visible: one clean peak', () => {
    const options = sweepAt(0.003)
    const ringing = generateSweptTrace({ ...options, ringing: true })
    const steady = generateSweptTrace(options)
    let worst = 0
    // Main sweep only: the flyback crosses resonances 9× faster (and there the lag is 9× larger).
    const from = indexAt(steady.tSeconds, steady.truth.sweepStartSeconds)
    const to = indexAt(steady.tSeconds, steady.truth.sweepEndSeconds)
    for (let i = from; i < to; i++) {
      worst = Math.max(worst, Math.abs(ringing.transmissionV[i] - steady.transmissionV[i]))
    }
    // Above a speed of 1e-4 the field is integrated; its lag of ≈ τ shifts the peak by 0.3 % of a linewidth here,
    // a change of at most ≈ 1.3 H/linewidth × 0.003 linewidth ≈ 0.004 H.
    expect(worst).toBeGreaterThan(0)
    expect(worst).toBeLessThan(0.01)
    const i = indexAt(ringing.tSeconds, ringing.truth.peaks[0].t)
    const top = argMax(ringing.transmissionV, i - 100, i + 100)
    expect(countLocalMaxima(ringing.transmissionV, top, top + 400, 1e-4)).toBe(0)
  })

  it('when ringing is asked for without an FSR in Hz then it is refused', () => {
    expect(() => generateSweptTrace({ ...clean, ringing: true })).toThrow(/ringing needs the FSR in Hz/)
  })
})
