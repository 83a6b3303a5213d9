import { frequencyAt, type SweepCalibration } from '../../calibration/calibrateSweep'
import { frac, median, signedCircular } from '../../numbers'
import type { SpectrumPeak } from '../readSpectrum'
import { alike } from './periodCandidates'

/** A family: resonances at one place mod 1 FSR (one transverse order, or a sideband), with its typical height. */
export interface Family {
  phase: number
  heightV: number
  members: number[]
  /**
   * A tall family that does not repeat where the sweep has room for it: no mode of the cavity (a mode resonates once
   * every FSR) but a resonance seen past a turn of a ramp-less sweep, or a glitch. It takes no part in any reading.
   */
  orphan: boolean
  /** Index of the family this one is a satellite of (see markSatellites), or −1. */
  satelliteOf: number
}

/** Groups resonances by their place mod 1 FSR: chains first (they are families by construction), then by nearness. */
export function familiesFrom(peaks: SpectrumPeak[], nu: number[], chains: number[][], linewidthFsr: number, relative: number, sigmaV: number): Family[] {
  const tolerance = Math.max(0.012, 3 * linewidthFsr)
  const groups: number[][] = chains.map((c) => c.slice())
  const inChain = new Set(chains.flat())
  peaks.forEach((_, i) => {
    if (!inChain.has(i)) groups.push([i])
  })
  const families = groups.map((g) => ({ phase: circularMean(g.map((i) => nu[i]), g.map((i) => peaks[i].heightV)), heightV: median(g.map((i) => peaks[i].heightV)), members: g, orphan: false, satelliteOf: -1 }))
  families.sort((a, b) => b.heightV - a.heightV)
  const merged: Family[] = []
  for (const f of families) {
    const home = merged.find((m) => circularDistance(m.phase, f.phase) <= tolerance && alike(m.heightV, f.heightV, sigmaV, relative))
    if (home) home.members.push(...f.members)
    else merged.push({ ...f, members: f.members.slice() })
  }
  return merged
}

export function markOrphans(families: Family[], nu: number[], calibration: SweepCalibration, startSeconds: number, endSeconds: number, sigmaV: number): void {
  const at = (t: number) => frequencyAt(calibration, t)
  const lo = Math.max(at(startSeconds) + 0.03, Math.min(...nu) - 0.5)
  const hi = Math.min(at(endSeconds) - 0.03, Math.max(...nu) + 0.5)
  const weakest = Math.min(...families.map((f) => f.heightV))
  for (const f of families) {
    if (f.heightV < Math.max(15 * sigmaV, 3 * weakest)) continue
    let room = 0
    for (let k = Math.ceil(lo - f.phase); k + f.phase <= hi; k++) room++
    // A mode family may miss a place at the ends of the calibrated stretch; an orphan misses most of them.
    const seen = new Set(f.members.map((i) => Math.round(nu[i] - f.phase)))
    if (room >= 2 * seen.size) f.orphan = true
  }
}

/**
 * A laser running on two longitudinal modes shows every cavity resonance twice, a fixed frequency apart and with a
 * fixed height ratio (common practice: a helium-neon laser often does). When three or more families each have a
 * partner at the same offset δ (not a Gouy-phase step) with the same height ratio (within 30 %), the smaller of
 * each pair is a satellite: explained by its partner's order, measured by nobody (the ratio is the same for every
 * order, so leaving satellites out does not move the shares). Returns δ, or null.
 */
export function markSatellites(families: Family[], predictedGouy: number, linewidthFsr: number, sigmaV: number): number | null {
  const tolerance = Math.max(0.01, 3 * linewidthFsr)
  const strong = families.filter((f) => !f.orphan && f.heightV >= 10 * sigmaV).slice(0, 8)
  let best: { offset: number; pairs: [Family, Family][]; weight: number } | null = null
  for (const a of strong) {
    for (const b of strong) {
      if (a === b || b.heightV > a.heightV) continue
      const offset = signedCircular(b.phase - a.phase)
      if (Math.abs(offset) < 2 * tolerance) continue
      // A step of the Gouy phase (order N to N + k) also repeats across families: not a satellite.
      const gouyStep = [1, 2, 3, 4].some((k) => Math.abs(signedCircular(Math.abs(offset) - (k * predictedGouy) / Math.PI)) < 0.05 || Math.abs(signedCircular(Math.abs(offset) + (k * predictedGouy) / Math.PI)) < 0.05)
      if (gouyStep) continue
      const pairs: [Family, Family][] = []
      for (const c of strong) {
        const d = strong.find((e) => e !== c && e.heightV <= c.heightV && Math.abs(signedCircular(e.phase - c.phase - offset)) <= tolerance)
        if (d) pairs.push([c, d])
      }
      if (pairs.length < 3) continue
      const ratios = pairs.map(([c, d]) => d.heightV / c.heightV)
      const meanRatio = ratios.reduce((x, y) => x + y, 0) / ratios.length
      if (ratios.some((r) => Math.abs(r / meanRatio - 1) > 0.3)) continue
      const weight = pairs.reduce((sum, [, d]) => sum + d.heightV, 0)
      if (!best || weight > best.weight) best = { offset, pairs, weight }
    }
  }
  if (!best) return null
  for (const [c, d] of best.pairs) d.satelliteOf = families.indexOf(c)
  return best.offset
}

function circularMean(values: number[], weights: number[]): number {
  let s = 0
  let c = 0
  values.forEach((v, k) => {
    s += weights[k] * Math.sin(2 * Math.PI * v)
    c += weights[k] * Math.cos(2 * Math.PI * v)
  })
  return frac(Math.atan2(s, c) / (2 * Math.PI))
}

function circularDistance(a: number, b: number): number {
  return Math.abs(signedCircular(a - b))
}
