import { transverseOffsetFsr } from '../cavity'
import { calibrateSweep, frequencyAt, type SweepCalibration } from '../calibration/calibrateSweep'
import { calibrateWithOrders } from '../calibration/calibrateWithOrders'
import { median, frac } from '../numbers'
import type { MeasuredResonance } from '../peaks/measureResonances'
import { assignOrders } from './assignOrders'
import { findFundamentals, type FundamentalComb } from './findFundamentals'
import { ladderReading } from './ladderReading'

/**
 * The TEM00 comb that best explains the whole spectrum. The tallest repeating family is usually TEM00, but a strong
 * order-1 resonance beside it, or a resonance past a sweep's turning point, can join the comb. Each candidate (the
 * comb found with two height limits, and each without its end members) calibrates the sweep and the resonances
 * are matched to the predicted orders (Siegman, "Lasers" (1986), ch. 19); the candidate whose predictions explain
 * the most resonance height, less the height left unexplained, wins (more members on a tie).
 */
export function chooseComb(
  measured: MeasuredResonance[],
  tOf: (m: MeasuredResonance) => number,
  predictedGouy: number,
  allowedOrders: number[],
  sidebandOffsetFsr: number | null,
  roughWidth: number,
  maxOrder: number,
): FundamentalComb {
  const positions = measured.map((m) => ({ center: m.centerIndex, height: m.heightV }))
  const toleranceFsr = 0.06
  const found = [findFundamentals(positions), findFundamentals(positions, { tallFraction: 0.5 })].map((c) =>
    dropTransverseEnds(c, measured, tOf, predictedGouy, allowedOrders, toleranceFsr),
  )
  const candidates: FundamentalComb[] = []
  const add = (c: FundamentalComb) => {
    if (c.members.length < 2) return
    if (candidates.some((d) => d.members.join() === c.members.join())) return
    candidates.push(c)
  }
  for (const c of found) {
    add(c)
    if (c.members.length >= 3) {
      add({ members: c.members.slice(1), fsrIndex: c.fsrIndex.slice(1) })
      add({ members: c.members.slice(0, -1), fsrIndex: c.fsrIndex.slice(0, -1) })
    }
    if (c.members.length >= 4) add({ members: c.members.slice(1, -1), fsrIndex: c.fsrIndex.slice(1, -1) })
  }
  if (candidates.length <= 1) return candidates[0] ?? found[0]
  let best = candidates[0]
  let bestScore = -Infinity
  for (const c of candidates) {
    let calibration = calibrateSweep(c.members.map((k) => tOf(measured[k])), c.fsrIndex)
    const members = new Set(c.members)
    const spacingSamples = (measured[c.members[c.members.length - 1]].centerIndex - measured[c.members[0]].centerIndex) / (c.fsrIndex[c.fsrIndex.length - 1] - c.fsrIndex[0])
    const tolerance = Math.min(0.06, Math.max(0.02, (4 * roughWidth) / spacingSamples))
    const assign = (cal: SweepCalibration, psi: number) =>
      assignOrders(
        measured.map((m, i) => ({ positionFsr: frequencyAt(cal, tOf(m)), weight: m.heightV, fundamental: members.has(i) })),
        psi,
        { maxOrder, toleranceFsr: tolerance, sidebandOffsetFsr: sidebandOffsetFsr === null ? null : frac(sidebandOffsetFsr), allowedOrders, maxGouyShiftRad: 0.03 * predictedGouy },
      )
    let assignment = assign(calibration, predictedGouy)
    // One round of the calibration refined with the matched carriers, so that a comb of two is judged fairly.
    const refined = calibrateWithOrders(
      measured
        .map((m, i) => ({ m, l: assignment.labels[i] }))
        .filter(({ l }) => l.kind === 'carrier' && l.order !== null)
        .map(({ m, l }) => ({ tSeconds: tOf(m), order: l.order!, weight: m.heightV ** 2 })),
      calibration,
      assignment.direction,
      predictedGouy,
      { outlierFsr: Math.max(1e-4, (0.5 * roughWidth) / spacingSamples), maxGouyShiftRad: c.members.length >= 3 ? 0.03 * predictedGouy : 0 },
    )
    calibration = refined.calibration
    assignment = assign(calibration, refined.gouyRad)
    let score = 0
    let total = 0
    assignment.labels.forEach((l, i) => {
      score += l.kind === 'unassigned' ? -measured[i].heightV : measured[i].heightV
      total += measured[i].heightV
    })
    const better = score > bestScore + 1e-3 * total || (Math.abs(score - bestScore) <= 1e-3 * total && c.members.length > best.members.length)
    if (better) {
      best = c
      bestScore = Math.max(score, bestScore)
    }
  }
  return best
}

/**
 * One TEM00 followed by orders 1, 2, … is equally spaced like a comb; when the comb is better read as that ladder,
 * only its tallest member is kept as TEM00 (the single-TEM00 path then reports the share of all resonance power).
 */
export function unlessLadder(
  comb: FundamentalComb,
  measured: MeasuredResonance[],
  gouy: number,
  sweepLengthSamples: number,
  allowedOrders: number[],
  roughWidth: number,
): FundamentalComb {
  if (comb.members.length < 2) return comb
  const positions = measured.map((m) => ({ center: m.centerIndex, height: m.heightV }))
  const spanSamples = Math.abs(measured[comb.members[comb.members.length - 1]].centerIndex - measured[comb.members[0]].centerIndex)
  const spacing = spanSamples / (comb.fsrIndex[comb.fsrIndex.length - 1] - comb.fsrIndex[0])
  const toleranceSamples = Math.max(2 * roughWidth, 0.02 * spacing)
  const reading = ladderReading(positions, comb, gouy, sweepLengthSamples, { allowedOrders, toleranceSamples })
  if (reading !== 'ladder') return reading === 'either' ? { ...comb, ladderPossible: true } : comb
  let tallest = comb.members[0]
  for (const k of comb.members) if (measured[k].heightV > measured[tallest].heightV) tallest = k
  return { members: [tallest], fsrIndex: [0] }
}

/**
 * A strong transverse mode one step beyond the last TEM00 can join the comb walk. Each end member is placed with
 * the calibration of the other members; when it sits much nearer a predicted transverse order (N·ψ/π either way,
 * Siegman, "Lasers" (1986), ch. 19) than the FSR index the comb gives it, and the others pin the sweep (three or
 * more of them) or it is much lower than they are, it is dropped.
 */
function dropTransverseEnds(
  comb: FundamentalComb,
  measured: MeasuredResonance[],
  tOf: (m: MeasuredResonance) => number,
  gouy: number,
  allowedOrders: number[],
  toleranceFsr: number,
): FundamentalComb {
  let members = comb.members.slice()
  let fsrIndex = comb.fsrIndex.slice()
  const offsets = allowedOrders.filter((order) => order > 0).map((order) => transverseOffsetFsr(order, gouy))
  const circular = (d: number) => Math.abs(d - Math.round(d))
  for (let round = 0; round < 2; round++) {
    let changed = false
    for (const end of [0, 1]) {
      if (members.length < 3) break
      const k = end === 0 ? 0 : members.length - 1
      const restMembers = members.filter((_, i) => i !== k)
      const restIndex = fsrIndex.filter((_, i) => i !== k)
      const calibration = calibrateSweep(restMembers.map((j) => tOf(measured[j])), restIndex)
      const nu = frequencyAt(calibration, tOf(measured[members[k]]))
      const fromIndex = Math.abs(nu - fsrIndex[k])
      const fromOrder = Math.min(...offsets.flatMap((o) => [circular(nu - o), circular(nu + o)]))
      const lower = measured[members[k]].heightV < 0.6 * median(restMembers.map((j) => measured[j].heightV))
      if (fromIndex > toleranceFsr && fromOrder < 0.5 * fromIndex && (restMembers.length >= 3 || lower)) {
        members = restMembers
        fsrIndex = restIndex.map((i) => i - restIndex[0])
        changed = true
      }
    }
    if (!changed) break
  }
  return { members, fsrIndex }
}
