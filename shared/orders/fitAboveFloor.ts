import { lineModelValues, type OrderPowerFit, type PredictedLine } from './fitOrderPowers'

/** Noise below this many digitiser steps does not dither the rounding (see fitAboveFloor). */
export const COARSE_DIGITISER_SIGMA = 0.5
/** Samples whose lines stand less than this many steps above the background are left out of the refit … */
const FLOOR_CODES = 0.5
/** … unless they lie within this many linewidths of a line's centre (every line keeps its core and stays measured). */
const CORE_LINEWIDTHS = 2
/** The refit needs at least this many samples per fitted parameter. */
const MIN_SAMPLES_PER_PARAMETER = 4

/** The samples about the lines, as the line model takes them. */
interface LineSamples {
  y: Float64Array
  nu: Float64Array
  stepFsr: Float64Array
  background: { x: Float64Array; degree: number }
}

/**
 * On a coarse digitiser with little noise the rounding error is no longer random: a quiet dark level sits on one
 * code wherever it truly lies inside that code, and the foot of every line reads as the floor until it crosses half
 * a code. The fit then takes the floor for the background and each small line's core for a line standing on a
 * pedestal of up to half a code (a bias of some tenths of a point per order on an 8-bit record). The samples where
 * the lines stand less than half a code above the background (they read as the floor whatever the lines do), away
 * from every line's core, are left out and the heights fitted again: the background then comes from the tall lines'
 * flanks, which cross many codes, where rounding averages out (Widrow & Kollár, "Quantization Noise" (2008), ch. 4
 * and 19: the rounding error is uniform and unbiased only when the signal spans many codes or noise of about half a
 * code dithers it). The areas stay those of the first fit. Measured on the quiet 8-bit session cases (30, three seed
 * bases): median error 0.39 → 0.10 points.
 */
export function fitAboveFloor(
  fit: OrderPowerFit,
  all: LineSamples,
  lines: PredictedLine[],
  quantumV: number,
  refit: (on: LineSamples) => OrderPowerFit,
  shape: Parameters<typeof lineModelValues>[3],
): OrderPowerFit {
  const model = lineModelValues(all.nu, lines, fit.lines.map((l) => l.heightV), shape)
  const centres = Float64Array.from(lines, (l) => l.nu).sort()
  const core = CORE_LINEWIDTHS / shape.finesse
  const y = Float64Array.from(all.y)
  let kept = 0
  let c = 0
  for (let i = 0; i < y.length; i++) {
    const v = all.nu[i]
    while (c + 1 < centres.length && Math.abs(centres[c + 1] - v) <= Math.abs(centres[c] - v)) c++
    if (model[i] < FLOOR_CODES * quantumV && !(Math.abs(centres[c] - v) <= core)) y[i] = NaN
    else kept++
  }
  if (kept < MIN_SAMPLES_PER_PARAMETER * (lines.length + all.background.degree + 1)) return fit
  const above = refit({ ...all, y })
  return { ...above, lines: above.lines.map((l, j) => ({ ...l, areaHeightV: fit.lines[j].areaHeightV, areaHeightErrorV: fit.lines[j].areaHeightErrorV })) }
}
