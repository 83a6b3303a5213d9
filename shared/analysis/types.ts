import { z } from 'zod'

const warningSchema = z.object({ code: z.string(), message: z.string() })

/** One resonance in the result. */
export const analysisPeakSchema = z.object({
  /** Centre on the file's own time axis, seconds. */
  t: z.number(),
  order: z.number().int().nullable(),
  kind: z.enum(['carrier', 'sideband', 'unassigned']),
  /** Height above the baseline, volts. */
  height: z.number(),
  heightError: z.number().nullable(),
  fwhmSeconds: z.number(),
  /** Integrated power: area above the baseline, V·s on the time axis. */
  area: z.number(),
  /** Share of the carrier power in the full FSR periods (0 for peaks outside them, sidebands and unassigned). */
  share: z.number(),
  /** Position in FSR units above the nearest TEM00 (0 … 1), null without calibration. */
  positionFsr: z.number().nullable(),
  fitted: z.boolean(),
})

/** One order as the line model measured it, whether or not it stands out of the noise. */
export const orderEstimateSchema = z.object({
  order: z.number().int(),
  /** Share of the total carrier power; an estimate that noise pushed below zero reads 0 (its significance keeps the sign). */
  share: z.number(),
  /** Standard error of the share, from the fit's covariance. */
  shareError: z.number().nullable(),
  /** The order's summed measure over its standard error (the matched filter's significance with heights). */
  significance: z.number().nullable(),
  /** True when the order is in `orders` (it stands out of the noise by 3σ). */
  reported: z.boolean(),
})

/** What `analyzeTrace` returns; the command line prints it and the server stores it. */
export const analysisResultSchema = z.object({
  fundamentalFraction: z.number().min(0).max(1),
  fundamentalFractionError: z.number().nullable(),
  fsr: z.object({
    /** Median TEM00 spacing on the file's time axis. */
    seconds: z.number().nullable(),
    /** c / 2L from the cavity geometry. */
    hz: z.number(),
    meanSpacingSeconds: z.number().nullable(),
    spacingRangeSeconds: z.tuple([z.number(), z.number()]).nullable(),
  }),
  finesse: z.number().nullable(),
  finesseError: z.number().nullable(),
  linewidthHz: z.number().nullable(),
  /**
   * Carrier power share per transverse order that stands out of the noise (3σ), keyed "0", "1", …. With
   * `belowNoiseShare` it sums to 1.
   */
  orders: z.record(z.string(), z.number()),
  /**
   * Summed share of the orders measured at their predicted places that do not stand out of the noise. They are
   * counted in the total so that leaving them out does not raise the TEM00 fraction (an estimate below zero counts
   * as zero). Absent in results stored before it was reported.
   */
  belowNoiseShare: z.number().optional(),
  /** Every order measured at its predicted places, with its error; empty when shares come from the peaks found. Absent in older results. */
  orderEstimates: z.array(orderEstimateSchema).optional(),
  /**
   * Astigmatic split between neighbouring lines of one order, FSR units: order N shows up to N + 1 lines this far
   * apart (0 when none is seen). Absent in older results.
   */
  orderSplitFsr: z.number().optional(),
  misalignmentShare: z.number(),
  mismatchShare: z.number(),
  reading: z.string(),
  measure: z.enum(['area', 'height']),
  measureReason: z.string(),
  gouy: z.object({
    predictedOneWayRad: z.number(),
    measuredOneWayRad: z.number().nullable(),
    /** Mirror spacing the measured phase implies with the entered radii, mm, when it disagrees with the geometry (absent in older results). */
    impliedLengthMm: z.number().nullable().optional(),
  }),
  /**
   * Another reading of the resonances that explains them about as well (see the `ambiguous_reading` warning): its
   * rough TEM00 fraction, sweep direction, Gouy phase and FSR on the time axis. Null when the reading is clear;
   * absent in older results.
   */
  alternativeReading: z
    .object({ fundamentalFraction: z.number(), direction: z.enum(['up', 'down']), gouyOneWayRad: z.number(), fsrSeconds: z.number() })
    .nullable()
    .optional(),
  peaks: z.array(analysisPeakSchema),
  sweep: z.object({
    direction: z.enum(['up', 'down', 'unknown']),
    rampDirection: z.enum(['rising', 'falling', 'unknown']),
    startTime: z.number(),
    endTime: z.number(),
    evidence: z.string(),
    /** What decided the optical sweep direction (the order pattern, or the prior that low orders are stronger); absent in results stored before it was reported. */
    directionEvidence: z.string().optional(),
  }),
  calibration: z.object({
    polynomialOrder: z.number().int(),
    residualRmsFsr: z.number().nullable(),
    fundamentalCount: z.number().int(),
    /** Centres of the TEM00 resonances that set the calibration, seconds on the file's time axis. */
    fundamentalTimes: z.array(z.number()),
  }),
  fitQuality: z.object({
    /** Median reduced χ² of the fitted resonances (noise from the trace). */
    medianReducedChiSquare: z.number().nullable(),
    fittedCount: z.number().int(),
    peakCount: z.number().int(),
    /** RMS distance of carriers from their predicted positions, FSR units. */
    orderResidualRmsFsr: z.number().nullable(),
    /** Reduced χ² of the model of every line at its predicted place with the shared linewidth (null without one). */
    lineModelReducedChiSquare: z.number().nullable(),
    /**
     * What the chosen reading of the spectrum leaves unexplained, in units of the tallest resonance's height
     * (resonances no order explains, lines missing where an order should repeat, implausible order powers); 0 is a
     * perfect account. Null without a reading; absent in older results.
     */
    readingCost: z.number().nullable().optional(),
  }),
  samplesPerLinewidth: z.number().nullable(),
  noise: z.object({ sigmaV: z.number(), darkLevelV: z.number() }),
  channels: z.object({ transmission: z.string(), ramp: z.string().nullable() }),
  warnings: z.array(warningSchema),
})

export type AnalysisResult = z.infer<typeof analysisResultSchema>
export type AnalysisPeak = z.infer<typeof analysisPeakSchema>
export type OrderEstimate = z.infer<typeof orderEstimateSchema>

export interface AnalyzeOptions {
  /** Override role detection: channel name or 0-based index. */
  transmissionChannel?: string | number
  /** Channel name or index of the ramp monitor; null = ignore the ramp. */
  rampChannel?: string | number | null
  sweepPart?: { startTime: number; endTime: number } | 'auto'
  gouyOverrideRad?: number
  peakModel?: 'auto' | 'lorentzian' | 'airy'
  /** Else cavity.modulationMHz. */
  modulationMHz?: number
  /**
   * Which way the optical frequency runs during the sweep, when the lab knows it ('up': rising with time). It settles
   * the one thing a spectrum cannot: its mirror image, read with TEM00 at the other end of the orders. @default from the data
   */
  sweepDirection?: 'up' | 'down'
}
