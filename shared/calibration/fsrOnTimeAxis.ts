import { sweepRateAt, type SweepCalibration } from './calibrateSweep'

/**
 * The FSR on the file's time axis: the TEM00 spacings (median, mean, range) with two or more TEM00; with one, the
 * local period of the calibrated sweep at it (its inverse rate, which the transverse families pin).
 */
export function fsrOnTimeAxis(calibration: SweepCalibration | null, fundamentalTimes: number[]): { seconds: number | null; meanSpacingSeconds: number | null; spacingRangeSeconds: [number, number] | null } {
  if (!calibration) return { seconds: null, meanSpacingSeconds: null, spacingRangeSeconds: null }
  if (fundamentalTimes.length === 1) {
    const local = 1 / Math.abs(sweepRateAt(calibration, fundamentalTimes[0]))
    return { seconds: local, meanSpacingSeconds: local, spacingRangeSeconds: [local, local] }
  }
  return { seconds: calibration.fsrSeconds, meanSpacingSeconds: calibration.meanSpacingSeconds, spacingRangeSeconds: calibration.spacingRangeSeconds }
}
