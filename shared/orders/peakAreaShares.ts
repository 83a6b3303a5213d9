import { sweepRateAt, type SweepCalibration } from '../calibration/calibrateSweep'
import type { MeasuredResonance } from '../peaks/measureResonances'
import type { OrderLabel } from './assignOrders'
import type { Shares } from './measureOrderShares'

/** Shares from the integrated power of each labelled resonance over whole FSR periods (areas per unit frequency). */
export function peakAreaShares(
  measured: MeasuredResonance[],
  labels: OrderLabel[],
  positions: number[],
  calibration: SweepCalibration,
  fsrIndex: number[],
  toleranceFsr: number,
  dt: number,
  tOf: (m: MeasuredResonance) => number,
): Shares | null {
  const first = Math.min(...fsrIndex)
  const last = Math.max(...fsrIndex)
  const counted = (i: number) => positions[i] >= first - toleranceFsr && positions[i] < last - toleranceFsr
  const power = measured.map((m) => m.areaVSamples * dt * Math.abs(sweepRateAt(calibration, tOf(m))))
  const byOrder = new Map<number, number>()
  // Any one-FSR stretch holds every order once: the fraction of each stretch, and their scatter.
  const periods = new Map<number, { fundamental: number; all: number }>()
  let total = 0
  for (let i = 0; i < measured.length; i++) {
    const l = labels[i]
    if (!counted(i) || l.kind !== 'carrier' || l.order === null || !(power[i] > 0)) continue
    total += power[i]
    byOrder.set(l.order, (byOrder.get(l.order) ?? 0) + power[i])
    const period = Math.floor(positions[i] - first + toleranceFsr)
    const p = periods.get(period) ?? { fundamental: 0, all: 0 }
    p.all += power[i]
    if (l.order === 0) p.fundamental += power[i]
    periods.set(period, p)
  }
  if (!(total > 0)) return null
  const orders: Record<string, number> = {}
  for (const order of [...byOrder.keys()].sort((a, b) => a - b)) orders[String(order)] = byOrder.get(order)! / total
  // The standard error of the mean of the periods' fractions (Bevington & Robinson, §4.1): the only error these
  // areas give, and one that holds a laser's power changing between periods.
  const fractions = [...periods.values()].map((p) => p.fundamental / p.all)
  const mean = fractions.reduce((a, b) => a + b, 0) / Math.max(1, fractions.length)
  const scatterError = fractions.length >= 2 ? Math.sqrt(fractions.reduce((a, f) => a + (f - mean) ** 2, 0) / (fractions.length - 1) / fractions.length) : null
  return areaShares(orders, scatterError, (order, positionFsr) => {
    const i = positions.indexOf(positionFsr)
    return i >= 0 && counted(i) && labels[i].kind === 'carrier' && labels[i].order === order ? power[i] / total : 0
  })
}

/** Shares measured by area, without the line model (no χ², no refined finesse, no estimates of unseen orders). */
function areaShares(orders: Record<string, number>, fundamentalFractionError: number | null, shareOfPeak: Shares['shareOfPeak']): Shares {
  return {
    orders,
    fundamentalFraction: orders['0'] ?? 0,
    fundamentalFractionError,
    measure: 'area',
    reducedChiSquare: null,
    finesse: null,
    belowNoiseShare: 0,
    orderEstimates: [],
    splitFsr: 0,
    shareOfPeak,
  }
}

/**
 * Without two TEM00 resonances the sweep cannot be calibrated, so no resonance can be given an order. The TEM00
 * fraction is then the TEM00 resonances' integrated power against all resonance power seen in the sweep: a rough
 * figure (the sweep may hold more or less than one FSR of transverse modes), flagged by `single_fundamental`.
 */
export function fundamentalOnlyShares(measured: MeasuredResonance[], members: number[]): Shares {
  const isFundamental = new Set(members)
  let fundamental = 0
  let all = 0
  for (let k = 0; k < measured.length; k++) {
    const area = Math.max(0, measured[k].areaVSamples)
    all += area
    if (isFundamental.has(k)) fundamental += area
  }
  const fraction = all > 0 ? fundamental / all : 1
  return areaShares({ '0': fraction }, null, (order) => (order === 0 && members.length > 0 ? fraction / members.length : 0))
}
