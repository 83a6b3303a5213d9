/**
 * Does a trace look like the cavity it was uploaded to? Pure: the measured figures, the cavity's expected ones and
 * the other cavities' Gouy phases in; a verdict out. The Gouy phase depends on the geometry alone (Kogelnik & Li,
 * Appl. Opt. 5, 1550 (1966)), so a trace whose transverse orders stand far from the predicted places belongs to
 * another geometry; the FSR-to-sweep ratio and the linewidth back it up against the cavity's own history.
 */
import type { FitCheck, FitFigure } from '../../shared/api/correctionSchemas'

/** A Gouy phase this far off (relative) is another cavity, not a length entered a little wrong (common practice). */
export const GOUY_OFF = 0.05
/** Scan to scan on one cavity and one piezo, the FSR takes about the same part of the sweep (common practice). */
export const FSR_SWEEP_OFF = 0.25
/** A linewidth half or twice the usual one is another cavity or badly dirty mirrors (common practice). */
export const LINEWIDTH_OFF = 1

export interface FitInputs {
  cavityName: string
  measuredGouyRad: number | null
  predictedGouyRad: number
  /** The engine's own word that the orders disagree with the geometry (geometry_mismatch). */
  geometryWarning: boolean
  fsrToSweep: number | null
  usualFsrToSweep: number | null
  linewidthHz: number | null
  usualLinewidthHz: number | null
  others: Array<{ cavityId: string; name: string; gouyOneWayRad: number }>
}

function figure(measured: number | null, expected: number | null, limit: number): FitFigure | null {
  if (measured === null || expected === null || !(expected > 0) || !Number.isFinite(measured)) return null
  const relative = measured / expected - 1
  return { measured, expected, relative, off: Math.abs(relative) > limit }
}

export function judgeFit(inputs: FitInputs): Pick<FitCheck, 'gouy' | 'fsrToSweep' | 'linewidthHz' | 'mismatch' | 'message' | 'candidates'> {
  const gouy = figure(inputs.measuredGouyRad, inputs.predictedGouyRad, GOUY_OFF)
  const fsrToSweep = figure(inputs.fsrToSweep, inputs.usualFsrToSweep, FSR_SWEEP_OFF)
  const linewidthHz = figure(inputs.linewidthHz, inputs.usualLinewidthHz, LINEWIDTH_OFF)
  const gouyOff = Boolean(gouy?.off && inputs.geometryWarning)
  // Without a measured Gouy phase, both history figures must disagree before the trace is called another cavity's.
  const historyOff = Boolean(fsrToSweep?.off && linewidthHz?.off)
  const mismatch = gouyOff || historyOff
  let message: string | null = null
  if (gouyOff && gouy) {
    message = `This trace does not look like ${inputs.cavityName} (measured Gouy phase ${gouy.measured.toFixed(3)} rad, expected ${gouy.expected.toFixed(3)} rad).`
  } else if (historyOff && fsrToSweep && linewidthHz) {
    message = `This trace does not look like ${inputs.cavityName} (the FSR takes ${(100 * fsrToSweep.measured).toFixed(1)} % of the sweep, usually ${(100 * fsrToSweep.expected).toFixed(1)} %; linewidth ${(linewidthHz.measured / 1e6).toPrecision(3)} MHz, usually ${(linewidthHz.expected / 1e6).toPrecision(3)} MHz).`
  }
  const measured = gouy?.measured
  const candidates =
    mismatch && measured !== undefined
      ? inputs.others
          .filter((other) => Math.abs(other.gouyOneWayRad / measured - 1) < Math.abs(measured / inputs.predictedGouyRad - 1))
          .sort((a, b) => Math.abs(a.gouyOneWayRad - measured) - Math.abs(b.gouyOneWayRad - measured))
      : mismatch
        ? inputs.others
        : []
  return { gouy, fsrToSweep, linewidthHz, mismatch, message, candidates }
}
