import { computeCavityModel, transverseOffsetFsr, type CavityGeometry, type CavityModel } from '../cavity'
import { EngineError, type EngineWarning } from '../errors'
import type { Trace } from '../trace/types'
import { selectSweep } from '../sweep/selectSweep'
import { estimateNoise } from '../peaks/estimateNoise'
import { estimateBaseline } from '../peaks/estimateBaseline'
import { findResonances } from '../peaks/findResonances'
import { smoothSignal } from '../peaks/smoothSignal'
import { fitResonanceShape } from '../peaks/fitResonanceShape'
import { findSweepInData } from '../sweep/findSweepInData'
import { calibrateWithOrders } from '../calibration/calibrateWithOrders'
import { orderFamilies } from '../orders/orderFamilies'
import { fitOrderPowers, type OrderPowerFit, type PredictedLine } from '../orders/fitOrderPowers'
import { measureResonances, type MeasuredResonance } from '../peaks/measureResonances'
import { fitRingdown } from '../peaks/fitRingdown'
import { calibrateSweep, frequencyAt, sweepRateAt, type SweepCalibration } from '../calibration/calibrateSweep'
import { findFundamentals, type FundamentalComb } from '../orders/findFundamentals'
import { ladderReading } from '../orders/ladderReading'
import { assignOrders, type OrderAssignment, type OrderLabel } from '../orders/assignOrders'
import { pickChannels } from './pickChannels'
import { readingOfShares } from './readingOfShares'
import { collectWarnings, SWEEP_SPEED_RINGING } from './collectWarnings'
import type { AnalysisPeak, AnalysisResult, AnalyzeOptions, OrderEstimate } from './types'

/** Highest transverse order the assignment considers. */
const MAX_ORDER = 10
/** Orders always measured at their predicted places, detected or not (the ones that tell the mode-match). */
const ALWAYS_MEASURED_ORDERS = 4
/** An order is reported when its summed height stands this many standard errors above zero (3σ: a chance excess in an empty order is 0.13 %, common practice). */
const REPORT_SIGNIFICANCE = 3

/**
 * Reads a swept-cavity trace: selects the sweep, finds and measures every resonance, calibrates time to optical
 * frequency on the TEM00 comb and the transverse modes, labels transverse orders by the Gouy phase (Siegman,
 * "Lasers" (1986), ch. 19) and reports the TEM00 fraction, the share per order, linewidth and finesse with warnings.
 * Two passes: the tall TEM00 resonances first give the linewidth; it then sets the smoothing for finding the weak
 * resonances, and every order is measured at its predicted place with that linewidth (see fitOrderPowers).
 */
export function analyzeTrace(trace: Trace, cavity: CavityGeometry, options: AnalyzeOptions = {}): AnalysisResult {
  const { transmissionChannel, rampChannel, sweepPart = 'auto', gouyOverrideRad, peakModel = 'auto' } = options
  const model = computeCavityModel(cavity)
  const modulationMHz = options.modulationMHz ?? cavity.modulationMHz
  const predictedGouy = gouyOverrideRad ?? model.gouyOneWayRad
  const channels = pickChannels(trace, transmissionChannel, rampChannel)
  const values = channels.transmission.values
  assertVaries(values)
  const dt = trace.sampleInterval
  const timeAt = (index: number) => trace.startTime + index * dt

  // 1. Sweep part: from the ramp, or from the resonances themselves when there is none.
  const range = sweepPart === 'auto' ? undefined : indexRange(trace, sweepPart)
  let sweep = selectSweep(channels.ramp?.values ?? null, trace.sampleCount, { range })
  let whole: PreparedSignal | null = null
  if (!channels.ramp && !range) {
    whole = prepareSignal(values)
    const tall = tallResonances(whole.signal, whole.sigmaV)
    sweep = findSweepInData(tall, trace.sampleCount)
  }
  const part = values.subarray(sweep.startIndex, sweep.endIndex)

  // 2. Baseline and noise (without a ramp they were found on the whole record already: the same drift-following
  // baseline and noise serve the part).
  const { signal, sigmaV, darkLevelV, quantumV } = whole
    ? { ...whole, signal: whole.signal.subarray(sweep.startIndex, sweep.endIndex) }
    : prepareSignal(part)

  // 3. Pass 1: the tall resonances give the TEM00 linewidth in samples.
  const tall = tallResonances(signal, sigmaV)
  if (tall.length === 0) {
    throw new EngineError('no_resonances', 'No resonance stands out of the noise in the selected sweep; check the channel and the sweep range')
  }
  const tallComb = findFundamentals(tall.map((m) => ({ center: m.centerIndex, height: m.heightV })))
  const roughWidth = median(tallComb.members.map((k) => tall[k].fwhmSamples))

  // 4. Pass 2: smooth at half the linewidth (a matched filter's scale) and find every resonance standing out.
  const halfWidth = Math.max(0, Math.floor(roughWidth / 4))
  const smooth = halfWidth > 0 ? smoothSignal(signal, { halfWidth }) : signal
  const candidates = findResonances(smooth, sigmaV / Math.sqrt(2 * halfWidth + 1), { minSeparationSamples: 0.7 * roughWidth })
  for (const c of candidates) c.maxV = rawMax(signal, c.peakIndex, halfWidth)
  if (candidates.length === 0) {
    throw new EngineError('no_resonances', 'No resonance stands out of the noise in the selected sweep; check the channel and the sweep range')
  }
  const measured = measureResonances(signal, candidates, sigmaV, { model: peakModel === 'airy' ? 'airy' : 'lorentzian' })
  const tOf = (m: MeasuredResonance) => timeAt(sweep.startIndex + m.centerIndex)

  // 5. TEM00 comb and a first calibration on it.
  const families0 = orderFamilies(predictedGouy, MAX_ORDER, 0.005)
  const sidebandOffsetFsr = modulationMHz ? (modulationMHz * 1e6) / model.fsrHz : null
  const comb = unlessLadder(chooseComb(measured, tOf, predictedGouy, families0.leaders, sidebandOffsetFsr, roughWidth), measured, predictedGouy, signal.length, families0.leaders, roughWidth)
  let calibration: SweepCalibration | null = null
  if (comb.members.length >= 2) calibration = calibrateSweep(comb.members.map((k) => tOf(measured[k])), comb.fsrIndex)

  // 6. Linewidth: each TEM00 fitted with its sidebands, widths taken through the local sweep rate.
  let shapes = calibration ? fitFundamentals(signal, measured, comb.members, calibration, sidebandOffsetFsr, sigmaV, dt, tOf, null) : []
  let finesse = calibration ? finesseFrom(shapes) : null
  if (calibration && finesse && peakModel !== 'lorentzian' && (peakModel === 'airy' || finesse.value < 25)) {
    // Low finesse: the Lorentzian misreads the Airy wings (Born & Wolf, "Principles of Optics", §7.6).
    shapes = fitFundamentals(signal, measured, comb.members, calibration, sidebandOffsetFsr, sigmaV, dt, tOf, calibration.fsrSeconds / dt)
    finesse = finesseFrom(shapes)
  }
  const usedModel: 'lorentzian' | 'airy' = peakModel === 'airy' || (finesse !== null && finesse.value < 25 && peakModel !== 'lorentzian') ? 'airy' : 'lorentzian'
  const samplesPerLinewidth = shapes.length ? median(shapes.map((s) => s.fwhmSamples)) : median(comb.members.map((k) => measured[k].fwhmSamples))
  const linewidthFsr = finesse?.value ? 1 / finesse.value : 0.01
  for (const s of shapes) {
    measured[s.member] = { ...measured[s.member], centerIndex: s.centerIndex, heightV: s.heightV, fwhmSamples: s.fwhmSamples, fwhmErrorSamples: s.fwhmErrorSamples, fitted: true }
  }

  // 7. Orders: families of degenerate orders, assignment, then the calibration refined with every carrier.
  const toleranceFsr = Math.min(0.06, Math.max(0.02, 4 * linewidthFsr))
  const families = orderFamilies(predictedGouy, MAX_ORDER, Math.max(2 * linewidthFsr, 0.005))
  const isFundamental = new Set(comb.members)
  let labels: OrderLabel[]
  let direction: 'up' | 'down' | 'unknown' = 'unknown'
  let directionEvidence = 'Fewer than two TEM00 resonances: the optical sweep direction is unknown.'
  let gouy = predictedGouy
  let orderResidual: number | null = null
  if (calibration) {
    const firstCalibration: SweepCalibration = calibration
    const sidebandForAssignment = sidebandOffsetFsr === null ? null : frac(sidebandOffsetFsr)
    // With three or more TEM00 resonances only the resonances between the first and the last of them vote on the
    // direction and the Gouy phase: outside, the calibration is extrapolated, and a record without a ramp channel
    // may run past a turn of the sweep, where TEM00 resonances come back mirrored at transverse places.
    const combTimesSorted = comb.members.map((k) => tOf(measured[k])).sort((a, b) => a - b)
    const votes = (i: number) => {
      if (comb.members.length < 3) return true
      const t = tOf(measured[i])
      return t >= combTimesSorted[0] && t <= combTimesSorted[combTimesSorted.length - 1]
    }
    const assign = (cal: SweepCalibration, psi: number, tolerance: number, maxShift: number, directions: ('up' | 'down')[]) =>
      assignOrders(
        measured.map((m, i) => ({ positionFsr: frequencyAt(cal, tOf(m)), weight: votes(i) ? m.heightV : 0, fundamental: isFundamental.has(i) })),
        psi,
        { maxOrder: MAX_ORDER, toleranceFsr: tolerance, sidebandOffsetFsr: sidebandForAssignment, allowedOrders: families.leaders, maxGouyShiftRad: maxShift, directions },
      )
    // ψ is refined only when three or more TEM00 resonances pin the sweep: with two, a bend of the sweep and a
    // change of ψ move the transverse modes alike and cannot be told apart.
    const maxShift = comb.members.length >= 3 ? 0.03 * predictedGouy : 0
    const assignAndRefine = (directions: ('up' | 'down')[]) => {
      let cal = firstCalibration
      let psi = predictedGouy
      let assignment = assign(cal, psi, toleranceFsr, maxShift, directions)
      for (let round = 0; round < 2; round++) {
        const points = measured
          .map((m, i) => ({ m, l: assignment.labels[i] }))
          .filter(({ l }, i) => l.kind === 'carrier' && l.order !== null && votes(i))
          .map(({ m, l }) => ({ tSeconds: tOf(m), order: l.order!, weight: Math.min(m.heightV / sigmaV, 200) ** 2 }))
        const refined = calibrateWithOrders(points, cal, assignment.direction, predictedGouy, { maxGouyShiftRad: maxShift, outlierFsr: Math.max(1e-4, 0.5 * linewidthFsr) })
        cal = refined.calibration
        psi = refined.gouyRad
        assignment = assign(cal, psi, Math.min(toleranceFsr, Math.max(0.01, 3 * linewidthFsr)), 1e-3 * predictedGouy, directions)
      }
      return { assignment, calibration: cal, gouy: psi }
    }
    let outcome = assignAndRefine(['up', 'down'])
    directionEvidence = outcome.assignment.directionEvidence
    if (!outcome.assignment.directionSettled && finesse) {
      // The resonances found do not settle the direction (none stood out, or the pattern is nearly symmetric):
      // measure every order at its predicted places for both directions, where the matched filter sums the weak
      // lines of every FSR, and keep the direction whose transverse lines stand out more.
      const verdict = directionByLineModel((d, o) => ({
        signal, raw: part, darkLevelV, sigmaV, calibration: o.calibration, direction: d, gouy: o.gouy, finesse: finesse!.value,
        sidebands: sidebandOffsetFsr && shapes.length ? { offsetFsr: sidebandOffsetFsr, ratio: median(shapes.map((sh) => sh.sidebandRatio)) } : null,
        orders: families.leaders.filter((order) => order <= ALWAYS_MEASURED_ORDERS), detected: [], placementToleranceFsr: 0,
        firstIndex: Math.min(...comb.fsrIndex), lastIndex: Math.max(...comb.fsrIndex),
        startSeconds: timeAt(sweep.startIndex), dtSeconds: dt, samplesPerLinewidth, preferHeight: true,
      }), outcome, assignAndRefine)
      if (verdict) {
        outcome = verdict.outcome
        directionEvidence = verdict.evidence
      }
    }
    const assignment = outcome.assignment
    calibration = outcome.calibration
    gouy = outcome.gouy
    labels = assignment.labels
    direction = assignment.direction
    orderResidual = assignment.residualRmsFsr
  } else {
    labels = measured.map((_, i) =>
      isFundamental.has(i) ? { kind: 'carrier', order: 0, residualFsr: 0 } : { kind: 'unassigned', order: null, residualFsr: NaN },
    )
  }
  const positions = measured.map((m) => (calibration ? frequencyAt(calibration, tOf(m)) : NaN))
  const sweepSpeed = sweepSpeedOf(calibration, model, finesse?.value ?? null)
  // A fast sweep rings: its ring-down lobes are folded into their resonances (left out of the list of peaks).
  const lobes = sweepSpeed && sweepSpeed.speed >= SWEEP_SPEED_RINGING ? ringLobes(measured, labels, tOf, sweepSpeed.decaySeconds) : new Map<number, number>()
  const lobeArea = new Map<number, number>()
  for (const [lobe, owner] of lobes) lobeArea.set(owner, (lobeArea.get(owner) ?? 0) + measured[lobe].areaVSamples)

  // 8. Power per order: every order measured at its predicted place over whole FSR periods.
  const fastStructure = tall.spikeTrains === true || comb.members.some((k) => measured[k].lobeCount >= 3)
  const ordersMeasured = measuredOrders(families.leaders, labels)
  let shares = calibration && finesse
    ? measureOrderShares({
        signal, raw: part, darkLevelV, sigmaV, calibration, direction: direction === 'down' ? 'down' : 'up', gouy, finesse: finesse.value,
        sidebands: sidebandOffsetFsr && shapes.length ? { offsetFsr: sidebandOffsetFsr, ratio: median(shapes.map((s) => s.sidebandRatio)) } : null,
        orders: ordersMeasured,
        // Splits of up to 8 linewidths (at most 0.01 FSR) between neighbouring lines of an order are looked for.
        splitReachFsr: (Math.min(8 / finesse.value, 0.01) * Math.max(...ordersMeasured)) / 2,
        detected: measured
          .map((m, i) => ({ nu: positions[i], order: labels[i].kind === 'carrier' ? labels[i].order : null, heightV: m.heightV }))
          .filter((d): d is { nu: number; order: number; heightV: number } => d.order !== null && Number.isFinite(d.nu)),
        placementToleranceFsr: Math.min(toleranceFsr, Math.max(0.01, 3 * linewidthFsr)),
        firstIndex: Math.min(...comb.fsrIndex), lastIndex: Math.max(...comb.fsrIndex),
        startSeconds: timeAt(sweep.startIndex), dtSeconds: dt, samplesPerLinewidth,
        preferHeight: samplesPerLinewidth >= 6 && !fastStructure,
      })
    : fundamentalOnlyShares(measured, comb.members)
  if (calibration && shares.reducedChiSquare !== null && shares.reducedChiSquare > MAX_MODEL_CHI_SQUARE) {
    // The lines do not follow one shared shape (split, ringing or distorted resonances, a poorly followed sweep):
    // fall back to the integrated power of each resonance found, wherever it sits.
    const fallback = peakAreaShares(measured, labels, positions, calibration, comb.fsrIndex, toleranceFsr, dt, tOf)
    if (fallback) shares = { ...fallback, reducedChiSquare: shares.reducedChiSquare }
  }
  const { orders, fundamentalFraction } = shares
  const useHeight = shares.measure === 'height'
  // The finesse of the joint line model replaces the TEM00 fits' when the model follows the data.
  if (finesse && shares.finesse !== null && shares.reducedChiSquare !== null && shares.reducedChiSquare <= MAX_LINE_CHI_SQUARE) {
    finesse = { value: shares.finesse, error: finesse.error }
  }
  // A ringing sweep widens every line: the finesse then comes from the ring-down of the TEM00 resonances.
  const apparentFinesse = finesse?.value ?? null
  const ringdown = calibration && finesse && sweepSpeed && sweepSpeed.speed >= SWEEP_SPEED_RINGING
    ? finesseFromRingdown({ signal, measured, members: comb.members, lobes, calibration, tOf, startSeconds: timeAt(sweep.startIndex), dt, sigmaV, fsrHz: model.fsrHz, apparentFinesse: finesse.value })
    : null
  if (ringdown) finesse = ringdown

  const peaks: AnalysisPeak[] = measured.flatMap((m, i) => {
    if (lobes.has(i)) return []
    const l = labels[i]
    return {
      t: tOf(m),
      order: l.kind === 'unassigned' ? null : l.order,
      kind: l.kind,
      height: m.heightV,
      heightError: Number.isFinite(m.heightErrorV) ? m.heightErrorV : null,
      fwhmSeconds: m.fwhmSamples * dt,
      area: (m.areaVSamples + (lobeArea.get(i) ?? 0)) * dt,
      share: l.kind === 'carrier' && l.order !== null ? shares.shareOfPeak(l.order, positions[i]) : 0,
      positionFsr: Number.isFinite(positions[i]) ? orientedFraction(positions[i], direction) : null,
      fitted: m.fitted,
    }
  })

  const warnings: EngineWarning[] = [
    ...trace.warnings,
    ...(shares.splitFsr > 0
      ? [{
          code: 'split_orders',
          message: `The transverse orders are split: order N shows up to N + 1 lines about ${fmt(shares.splitFsr * (finesse?.value ?? 0))} linewidths (${shares.splitFsr.toPrecision(2)} FSR) apart, as astigmatism makes the Gouy phase differ between the two transverse axes (tilted or off-axis mirrors). Each line is measured and the order's power is their sum.`,
        }]
      : []),
    ...(comb.ladderPossible
      ? [{
          code: 'comb_or_ladder',
          message: `The two tall resonances were read as two TEM00 one FSR apart, but they fit one TEM00 and its order-1 mode just as well (the smaller is ${fmt((100 * Math.min(...comb.members.map((k) => measured[k].heightV))) / Math.max(...comb.members.map((k) => measured[k].heightV)))} % of the taller and nothing else is seen). Sweep over more than one FSR so that a third TEM00 or the other orders decide it.`,
        }]
      : []),
    ...collectWarnings({
      part,
      signal,
      sigmaV,
      quantumV,
      measured,
      labels,
      fundamentals: comb.members,
      samplesPerLinewidth,
      gouyRad: gouy,
      linewidthFsr,
      toleranceFsr,
      model,
      orders,
      orderResidualRmsFsr: orderResidual,
      sweepSpeed: sweepSpeed?.speed ?? null,
      ringdownFinesse: ringdown && apparentFinesse !== null ? { value: ringdown.value, apparent: apparentFinesse } : null,
      spikeTrains: tall.spikeTrains === true,
    }),
  ]
  const misalignmentShare = orders['1'] ?? 0
  const mismatchShare = orders['2'] ?? 0
  const chi = measured.filter((m, i) => !lobes.has(i) && m.fitted && Number.isFinite(m.reducedChiSquare)).map((m) => m.reducedChiSquare)
  const fsrHz = model.fsrHz
  const combTimes = comb.members.map((k) => tOf(measured[k]))
  return {
    fundamentalFraction,
    fundamentalFractionError: shares.fundamentalFractionError,
    fsr: {
      seconds: calibration?.fsrSeconds ?? null,
      hz: fsrHz,
      meanSpacingSeconds: calibration?.meanSpacingSeconds ?? null,
      spacingRangeSeconds: calibration?.spacingRangeSeconds ?? null,
    },
    finesse: finesse?.value ?? null,
    finesseError: finesse?.error ?? null,
    linewidthHz: finesse?.value ? fsrHz / finesse.value : null,
    orders,
    belowNoiseShare: shares.belowNoiseShare,
    orderEstimates: shares.orderEstimates,
    orderSplitFsr: shares.splitFsr,
    misalignmentShare,
    mismatchShare,
    reading: calibration
      ? readingOfShares(fundamentalFraction, misalignmentShare, mismatchShare)
      : `About ${(100 * fundamentalFraction).toFixed(0)} % of the resonance power seen is in TEM00, but with fewer than two TEM00 resonances in the sweep no other resonance can be given an order, so misalignment and mismatch cannot be told apart. Sweep over more than one FSR and analyse again.`,
    measure: useHeight ? 'height' : 'area',
    measureReason: useHeight
      ? `Fitted heights (${usedModel} lines at the predicted places, one shared linewidth): the resonances are well sampled (${fmt(samplesPerLinewidth)} samples per linewidth) and smooth.`
      : `Integrated power (area): ${fastStructure ? 'fast structure inside the resonances' : samplesPerLinewidth < 6 ? `only ${fmt(samplesPerLinewidth)} samples per linewidth` : 'the lines do not follow the fitted shape'} makes heights unreliable.`,
    gouy: { predictedOneWayRad: predictedGouy, measuredOneWayRad: calibration ? gouy : null },
    peaks,
    sweep: {
      direction,
      rampDirection: sweep.rampDirection,
      startTime: timeAt(sweep.startIndex),
      endTime: timeAt(sweep.endIndex - 1),
      evidence: sweep.evidence,
      directionEvidence,
    },
    calibration: {
      polynomialOrder: calibration?.polynomialOrder ?? 0,
      residualRmsFsr: calibration?.residualRmsFsr ?? null,
      fundamentalCount: comb.members.length,
      fundamentalTimes: combTimes,
    },
    fitQuality: {
      medianReducedChiSquare: chi.length ? median(chi) : null,
      fittedCount: chi.length,
      peakCount: peaks.length,
      orderResidualRmsFsr: orderResidual,
      lineModelReducedChiSquare: shares.reducedChiSquare,
    },
    samplesPerLinewidth: Number.isFinite(samplesPerLinewidth) ? samplesPerLinewidth : null,
    noise: { sigmaV, darkLevelV },
    channels: { transmission: channels.transmission.name, ramp: channels.ramp?.name ?? null },
    warnings,
  }
}

/**
 * The TEM00 comb that best explains the whole spectrum. The tallest repeating family is usually TEM00, but a strong
 * order-1 resonance beside it, or a resonance past a sweep's turning point, can join the comb. Each candidate (the
 * comb found with two height limits, and each without its end members) calibrates the sweep and the resonances
 * are matched to the predicted orders (Siegman, "Lasers" (1986), ch. 19); the candidate whose predictions explain
 * the most resonance height, less the height left unexplained, wins (more members on a tie).
 */
function chooseComb(
  measured: MeasuredResonance[],
  tOf: (m: MeasuredResonance) => number,
  predictedGouy: number,
  allowedOrders: number[],
  sidebandOffsetFsr: number | null,
  roughWidth: number,
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
        { maxOrder: MAX_ORDER, toleranceFsr: tolerance, sidebandOffsetFsr: sidebandOffsetFsr === null ? null : frac(sidebandOffsetFsr), allowedOrders, maxGouyShiftRad: 0.03 * predictedGouy },
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
function unlessLadder(
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

interface PreparedSignal {
  signal: Float64Array
  sigmaV: number
  darkLevelV: number
  quantumV: number
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

/** Baseline-subtracted signal with its noise level. */
function prepareSignal(part: Float64Array): PreparedSignal {
  const noise = estimateNoise(part)
  const sigmaV = Math.max(noise.sigmaV, 1e-9 * spanOf(part))
  const { baselineV, darkLevelV } = estimateBaseline(part, sigmaV)
  // The baseline's own array becomes the signal (one array less on long records).
  const signal = subtractInPlace(part, baselineV)
  return { signal, sigmaV, darkLevelV, quantumV: noise.quantumV }
}

/** part − baseline, written over the baseline's array (non-finite samples become 0). */
function subtractInPlace(part: Float64Array, baselineV: Float64Array): Float64Array {
  for (let i = 0; i < part.length; i++) {
    const v = part[i]
    baselineV[i] = v - v === 0 ? v - baselineV[i] : 0
  }
  return baselineV
}

/** A tall resonance measured from its half-maximum crossings. */
interface TallResonance {
  centerIndex: number
  heightV: number
  fwhmSamples: number
}

/**
 * The tallest resonances (at least a fifth of the highest sample), each measured between its half-maximum crossings
 * on the raw samples: enough for the TEM00 comb and its width, whatever the sampling (a slope shallower than the
 * noise cannot stop a walk to half height, unlike a walk to the valleys).
 */
/**
 * A laser-frequency dither of about a linewidth or more, faster than the sweep crosses a linewidth, breaks each
 * resonance into a train of spikes, one or two per dither period, which the search finds one by one. Such trains
 * show as gaps of two sizes: short ones inside a train, long ones between resonances. When the sorted gaps jump
 * by 4× or more and the groups below the jump hold four or more spikes each (a carrier with two sidebands makes
 * three), each group is one resonance: its centre the height-weighted mean, its width its extent. Null when the
 * tall resonances are no such trains.
 */
function mergeSpikeTrains(tall: TallResonance[]): TallResonance[] | null {
  if (tall.length < 8) return null
  const gaps = tall.slice(1).map((t, k) => t.centerIndex - tall[k].centerIndex)
  const sorted = gaps.slice().sort((a, b) => a - b)
  let jump = 0
  let at = -1
  for (let k = 2; k + 1 < sorted.length; k++) {
    const ratio = sorted[k + 1] / Math.max(sorted[k], 1e-9)
    if (ratio > jump) {
      jump = ratio
      at = k
    }
  }
  if (jump < 4 || at < 0) return null
  const limit = Math.sqrt(sorted[at] * sorted[at + 1])
  const groups: TallResonance[][] = [[tall[0]]]
  for (let k = 1; k < tall.length; k++) {
    if (gaps[k - 1] < limit) groups[groups.length - 1].push(tall[k])
    else groups.push([tall[k]])
  }
  const sizes = groups.map((g) => g.length).sort((a, b) => a - b)
  if (sizes[sizes.length >> 1] < 4) return null
  return groups.map((g) => {
    const weight = g.reduce((sum, t) => sum + t.heightV, 0)
    const width = median(g.map((t) => t.fwhmSamples))
    return {
      centerIndex: g.reduce((sum, t) => sum + t.heightV * t.centerIndex, 0) / weight,
      heightV: Math.max(...g.map((t) => t.heightV)),
      fwhmSamples: g[g.length - 1].centerIndex - g[0].centerIndex + width,
    }
  })
}

function tallResonances(signal: Float64Array, sigmaV: number): TallResonance[] & { spikeTrains?: boolean } {
  const found = singleTallResonances(signal, sigmaV)
  const merged = mergeSpikeTrains(found)
  return merged ? Object.assign(merged, { spikeTrains: true }) : found
}

function singleTallResonances(signal: Float64Array, sigmaV: number): TallResonance[] {
  let top = 0
  for (let i = 0; i < signal.length; i++) if (signal[i] > top) top = signal[i]
  const threshold = Math.max(Math.max(5, Math.sqrt(2 * Math.log(Math.max(signal.length, 2))) + 1), (0.2 * top) / sigmaV)
  const found = findResonances(signal, sigmaV, { thresholdSigma: threshold })
  return found.map((c) => {
    const half = c.maxV / 2
    let a = c.peakIndex
    while (a > 0 && signal[a - 1] > half) a--
    let b = c.peakIndex
    while (b + 1 < signal.length && signal[b + 1] > half) b++
    // Interpolated crossings on each side.
    const left = a > 0 ? a - (signal[a] - half) / (signal[a] - signal[a - 1] || 1) : a
    const right = b + 1 < signal.length ? b + (signal[b] - half) / (signal[b] - signal[b + 1] || 1) : b
    return { centerIndex: (left + right) / 2, heightV: c.maxV, fwhmSamples: Math.max(0.5, right - left) }
  })
}

function rawMax(signal: Float64Array, index: number, reach: number): number {
  let top = -Infinity
  for (let i = Math.max(0, index - reach); i <= Math.min(signal.length - 1, index + reach); i++) if (signal[i] > top) top = signal[i]
  return top
}

interface FundamentalShape {
  member: number
  centerIndex: number
  heightV: number
  fwhmSamples: number
  fwhmErrorSamples: number
  sidebandRatio: number
  /** Linewidth in FSR units through the local sweep rate. */
  linewidthFsr: number
}

/** Fits every TEM00 resonance (with its modulation sidebands when given) for width and height. */
function fitFundamentals(
  signal: Float64Array,
  measured: MeasuredResonance[],
  members: number[],
  calibration: SweepCalibration,
  sidebandOffsetFsr: number | null,
  sigmaV: number,
  dt: number,
  tOf: (m: MeasuredResonance) => number,
  periodSamples: number | null,
): FundamentalShape[] {
  const out: FundamentalShape[] = []
  for (const k of members) {
    const m = measured[k]
    const rate = Math.abs(sweepRateAt(calibration, tOf(m))) * dt
    if (!(rate > 0)) continue
    // Sidebands inside the window are part of the fit; carry them only when they sit within reach of the line.
    const d = sidebandOffsetFsr !== null ? sidebandOffsetFsr / rate : null
    const useSidebands = d !== null && d < 6 * m.fwhmSamples + 4
    const reach = 3 * m.fwhmSamples + (useSidebands ? d! : 0) + 2
    let lo = Math.ceil(m.centerIndex - reach)
    let hi = Math.floor(m.centerIndex + reach)
    for (let j = 0; j < measured.length; j++) {
      if (j === k) continue
      const gap = measured[j].centerIndex - m.centerIndex
      if (useSidebands && Math.abs(Math.abs(gap) - d!) < 1.5 * m.fwhmSamples + 1) continue
      if (gap > 0) hi = Math.min(hi, Math.floor(m.centerIndex + gap / 2))
      else lo = Math.max(lo, Math.ceil(m.centerIndex + gap / 2))
    }
    const shape = fitResonanceShape(
      signal,
      { centerIndex: m.centerIndex, heightV: m.heightV, fwhmSamples: m.fwhmSamples },
      { window: [lo, hi], sidebandOffsetSamples: useSidebands ? d : null, periodSamples, sigmaV },
    )
    if (!shape) continue
    out.push({
      member: k,
      centerIndex: shape.centerIndex,
      heightV: shape.heightV,
      fwhmSamples: shape.fwhmSamples,
      fwhmErrorSamples: shape.fwhmErrorSamples,
      sidebandRatio: shape.sidebandRatio,
      linewidthFsr: shape.fwhmSamples * rate,
    })
  }
  return out
}

/** Finesse = FSR / FWHM (common practice), the median over the TEM00 resonances. */
function finesseFrom(shapes: FundamentalShape[]): { value: number; error: number | null } | null {
  if (shapes.length === 0) return null
  const values = shapes.map((s) => 1 / s.linewidthFsr)
  const value = median(values)
  const spread = values.length > 2 ? (1.4826 * median(values.map((v) => Math.abs(v - value)))) / Math.sqrt(values.length) : null
  return { value, error: spread }
}

/** Orders measured at their predicted places: the low ones always, higher ones when a resonance was matched to them. */
function measuredOrders(leaders: number[], labels: OrderLabel[]): number[] {
  const seen = new Set(labels.filter((l) => l.kind === 'carrier' && l.order !== null).map((l) => l.order!))
  return leaders.filter((order) => order <= ALWAYS_MEASURED_ORDERS || seen.has(order))
}

interface ShareInputs {
  /** The selected part as recorded, and its dark level: the line model fits its own slow background. */
  raw: Float64Array
  darkLevelV: number
  /** Carriers found and labelled, at their measured places (FSR units on the calibrated axis). */
  detected: { nu: number; order: number; heightV: number }[]
  /** A predicted line moves to a detected carrier of its order within this distance, FSR units. */
  placementToleranceFsr: number
  signal: Float64Array
  sigmaV: number
  calibration: SweepCalibration
  direction: 'up' | 'down'
  gouy: number
  finesse: number
  sidebands: { offsetFsr: number; ratio: number } | null
  orders: number[]
  firstIndex: number
  lastIndex: number
  /** TEM00 linewidth in samples. */
  samplesPerLinewidth: number
  /** Time of the part's first sample and the sample interval, seconds. */
  startSeconds: number
  dtSeconds: number
  preferHeight: boolean
  /** Look for orders split by astigmatism (see splitLines): the sample windows widen by this much, FSR. @default 0 (no search) */
  splitReachFsr?: number
}

interface Shares {
  orders: Record<string, number>
  fundamentalFraction: number
  fundamentalFractionError: number | null
  measure: 'height' | 'area'
  reducedChiSquare: number | null
  shareOfPeak: (order: number, positionFsr: number) => number
  /** Finesse refined with the line model (null when the shares do not come from it). */
  finesse: number | null
  /** Summed share of the orders measured but not standing out of the noise (0 when shares come from peaks found). */
  belowNoiseShare: number
  /** Every order measured by the line model, reported or not (empty when shares come from the peaks found). */
  orderEstimates: OrderEstimate[]
  /** Astigmatic split between neighbouring lines of an order, FSR (0 when none is seen or none was looked for). */
  splitFsr: number
}

/** χ² per degree of freedom above which the line model is not trusted for heights. */
const MAX_LINE_CHI_SQUARE = 3
/** … and above which it is not trusted at all (the resonances found are measured one by one instead). */
const MAX_MODEL_CHI_SQUARE = 30

/** Shares from the integrated power of each labelled resonance over whole FSR periods (areas per unit frequency). */
function peakAreaShares(
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
  let total = 0
  for (let i = 0; i < measured.length; i++) {
    const l = labels[i]
    if (!counted(i) || l.kind !== 'carrier' || l.order === null || !(power[i] > 0)) continue
    total += power[i]
    byOrder.set(l.order, (byOrder.get(l.order) ?? 0) + power[i])
  }
  if (!(total > 0)) return null
  const orders: Record<string, number> = {}
  for (const order of [...byOrder.keys()].sort((a, b) => a - b)) orders[String(order)] = byOrder.get(order)! / total
  return {
    orders,
    fundamentalFraction: orders['0'] ?? 0,
    fundamentalFractionError: null,
    measure: 'area',
    reducedChiSquare: null,
    finesse: null,
    belowNoiseShare: 0,
    orderEstimates: [],
    splitFsr: 0,
    shareOfPeak: (order, positionFsr) => {
      const i = positions.indexOf(positionFsr)
      return i >= 0 && counted(i) && labels[i].kind === 'carrier' && labels[i].order === order ? power[i] / total : 0
    },
  }
}

/** Lines are modelled out to ± this many linewidths (at most half an FSR): the Airy wing left out there is 1e-4 of the height (1/(4·50²)), below the noise of any record. */
const SUPPORT_LINEWIDTHS = 50

/** The predicted lines of every order over the sweep, and the samples they reach (all, and every k-th for searches). */
interface LineProblem {
  lines: PredictedLine[]
  /** Each line's predicted place before it was moved to a resonance found there (FSR units). */
  predictedNu: number[]
  /** Half-width of the sample windows about each line, FSR units (support plus the split reach). */
  windowFsr: number
  all: { y: Float64Array; nu: Float64Array; stepFsr: Float64Array; background: { x: Float64Array; degree: number } }
  coarse: { y: Float64Array; nu: Float64Array; stepFsr: Float64Array; background: { x: Float64Array; degree: number } }
}

function lineProblem(input: ShareInputs): LineProblem {
  const { signal, calibration, direction, gouy, finesse, firstIndex, lastIndex } = input
  const n = signal.length
  const c = calibration.coefficients
  // ν(i) = Σ cₖ uᵏ with u linear in the sample index: evaluated on a coarse grid first, then only in the windows
  // the lines reach (a high-finesse trace is mostly dark between its resonances).
  const u0 = (input.startSeconds - calibration.t0Seconds) / calibration.scaleSeconds
  const du = input.dtSeconds / calibration.scaleSeconds
  const cell = Math.max(1, Math.floor(n / 4096))
  const gridNu = gridFrequencies(n, cell, u0, du, c)
  let lo = Infinity
  let hi = -Infinity
  for (let g = 0; g < gridNu.length; g++) {
    if (gridNu[g] < lo) lo = gridNu[g]
    if (gridNu[g] > hi) hi = gridNu[g]
  }
  const sign = direction === 'up' ? 1 : -1
  const lines: PredictedLine[] = []
  const predictedNu: number[] = []
  const epsilon = 1e-6
  const sidebandReach = input.sidebands && input.sidebands.ratio > 0 ? input.sidebands.offsetFsr : 0
  const support = Math.min(0.5, SUPPORT_LINEWIDTHS / finesse) + sidebandReach
  // Lines just past either end of the record are modelled too (not counted): a tall resonance cut by the end of
  // the record leaves its wing in the data.
  const reach = Math.min(support, 10 / finesse + sidebandReach)
  // Only the calibrated span (first to last TEM00, plus the reach) is modelled: beyond it the sweep model is
  // extrapolated, and a record without a ramp channel may run past a turn of the sweep, where resonances come
  // back at places no line predicts and would bend the shared linewidth.
  lo = Math.max(lo, Math.min(firstIndex, lastIndex) - reach)
  hi = Math.min(hi, Math.max(firstIndex, lastIndex) + reach)
  for (let p = Math.floor(lo) - 1; p <= Math.ceil(hi) + 1; p++) {
    for (const order of input.orders) {
      const at = p + sign * transverseOffsetFsr(order, gouy)
      if (at < lo - reach || at > hi + reach) continue
      const counted = direction === 'up' ? at >= firstIndex - epsilon && at < lastIndex - epsilon : at > firstIndex + epsilon && at <= lastIndex + epsilon
      // A line found where its order was matched sits where it was found: the calibration between TEM00
      // resonances is only as good as the sweep model, and a line misplaced by a linewidth loses its height.
      let placed = at
      let nearest = input.placementToleranceFsr
      for (const d of input.detected) {
        if (d.order === order && Math.abs(d.nu - at) <= nearest) {
          nearest = Math.abs(d.nu - at)
          placed = d.nu
        }
      }
      lines.push({ nu: placed, order, counted })
      predictedNu.push(at)
    }
  }
  const centres = Float64Array.from(lines, (l) => l.nu).sort()
  // Room for split orders (see splitLines): the samples stay the same whatever split is tried.
  const windowFsr = support + (input.splitReachFsr ?? 0)
  // The line model sees the record less its dark level, not the drift-following baseline: block levels also
  // carry the wings of the resonances in each block, which would bend the lines. Slow drift is a quadratic
  // background fitted with the lines instead.
  const { y, nu, stepFsr, x } = samplesNearLines(input.raw, input.darkLevelV, cell, gridNu, centres, windowFsr, u0, du, c, lo, hi)
  // Searches run on every k-th sample (about 8 per linewidth pin a width; on long windows down to 4 per
  // linewidth, keeping it near 15,000 samples); the final fit uses all.
  const stride = Math.max(1, Math.floor(input.samplesPerLinewidth / 8), Math.min(Math.floor(input.samplesPerLinewidth / 4), Math.ceil(y.length / 8_000)))
  const every = (a: Float64Array) => {
    if (stride === 1) return a
    const out = new Float64Array(Math.ceil(a.length / stride))
    for (let i = 0, k = 0; i < a.length; i += stride, k++) out[k] = a[i]
    return out
  }
  return {
    lines,
    predictedNu,
    windowFsr,
    all: { y, nu, stepFsr, background: { x, degree: 2 } },
    coarse: { y: every(y), nu: every(nu), stepFsr: every(stepFsr), background: { x: every(x), degree: 2 } },
  }
}

/** Per order: the summed fitted heights of its counted lines and the variance of that sum. */
function orderHeightSums(lines: PredictedLine[], fit: OrderPowerFit, order: number): { heightSum: number; heightVariance: number } {
  const m = lines.length
  let heightSum = 0
  let heightVariance = 0
  for (let j = 0; j < m; j++) {
    if (!lines[j].counted || lines[j].order !== order) continue
    heightSum += fit.lines[j].heightV
    for (let l = 0; l < m; l++) if (lines[l].counted && lines[l].order === order) heightVariance += fit.covariance[j * m + l]
  }
  return { heightSum, heightVariance }
}

/**
 * Astigmatism gives the two transverse axes different Gouy phases ψx, ψy, so HG_mn resonates at
 * (m + ½)ψx/π + (n + ½)ψy/π: order N = m + n splits into N + 1 lines at (m − n)·Δ/2 about its mean place,
 * Δ = (ψx − ψy)/π (Siegman, "Lasers" (1986), ch. 20). Each line gets its own height (the beam decides how the
 * order's power divides between HG_mn), and the order's power is their sum. Orders keep their predicted places
 * (a resonance found nearby may be one of the split lines).
 */
function splitLines(lines: PredictedLine[], predictedNu: number[], splitFsr: number): PredictedLine[] {
  return lines.flatMap((line, j) => {
    if (line.order === 0 || !(splitFsr > 0)) return [line]
    return Array.from({ length: line.order + 1 }, (_, k) => ({ ...line, nu: predictedNu[j] + (k - line.order / 2) * splitFsr }))
  })
}

/**
 * Whether the line model fits the samples about the transverse lines worse than those about the TEM00 lines:
 * χ²ᵥ near orders ≥ 1 above χ²ᵥ near TEM00 by more than four standard deviations √(2/ν) of the former
 * (Bevington & Robinson, "Data Reduction and Error Analysis", §11.1). Shape changes that every order shares
 * (ringing, detector low-pass, a misjudged noise level) raise both; a split order raises only the first.
 */
function transverseMisfit(
  on: { y: Float64Array; nu: Float64Array; stepFsr: Float64Array; background: { x: Float64Array; degree: number } },
  lines: PredictedLine[],
  fit: (subset: { y: Float64Array; nu: Float64Array; stepFsr: Float64Array; background: { x: Float64Array; degree: number } }) => OrderPowerFit,
  nearFsr: number,
): boolean {
  const sorted = lines.slice().sort((a, b) => a.nu - b.nu)
  // The nearest line by bisection (ν may rise or fall along the samples).
  const nearestTo = (v: number): PredictedLine | undefined => {
    let lo = 0
    let hi = sorted.length
    while (lo < hi) {
      const mid = (lo + hi) >> 1
      if (sorted[mid].nu < v) lo = mid + 1
      else hi = mid
    }
    const above = sorted[lo]
    const below = sorted[lo - 1]
    if (!above) return below
    if (!below) return above
    return v - below.nu <= above.nu - v ? below : above
  }
  const pick = (transverse: boolean) => {
    const keep: number[] = []
    for (let i = 0; i < on.nu.length; i++) {
      const v = on.nu[i]
      const nearest = nearestTo(v)
      if (nearest && Math.abs(nearest.nu - v) <= nearFsr && (nearest.order > 0) === transverse) keep.push(i)
    }
    const take = (a: Float64Array) => Float64Array.from(keep, (i) => a[i])
    return { count: keep.length, subset: { y: take(on.y), nu: take(on.nu), stepFsr: take(on.stepFsr), background: { x: take(on.background.x), degree: on.background.degree } } }
  }
  const transverse = pick(true)
  const fundamental = pick(false)
  if (transverse.count < 50 || fundamental.count < 50) return false
  const chiTransverse = fit(transverse.subset).reducedChiSquare
  const chiFundamental = fit(fundamental.subset).reducedChiSquare
  return chiTransverse > chiFundamental + 4 * Math.sqrt(2 / transverse.count)
}

/** Splits tried, in linewidths, from half a linewidth (below it the lines blur into one) to the reach allowed. */
const SPLIT_GRID_LINEWIDTHS = [0.5, 1, 2, 4, 8]

/**
 * The astigmatic split Δ (FSR) that the data support, or 0: χ² of the line model on a grid of splits, kept only
 * when it beats the unsplit model by more than the Bayesian information criterion's price of the extra heights,
 * k·ln n (Schwarz, Ann. Statist. 6, 461 (1978)), then refined by golden section on a log scale.
 */
function searchSplit(
  problem: LineProblem,
  input: ShareInputs,
  chiSquareOf: (lines: PredictedLine[]) => { chiSquare: number; parameters: number },
  finesse: number,
): number {
  const maxOrder = Math.max(...input.orders)
  if (!(maxOrder >= 1)) return 0
  const limit = (2 * (input.splitReachFsr ?? 0)) / maxOrder
  const n = problem.coarse.y.length
  const unsplit = chiSquareOf(problem.lines)
  const score = (splitFsr: number) => {
    const trial = chiSquareOf(splitLines(problem.lines, problem.predictedNu, splitFsr))
    return trial.chiSquare + (trial.parameters - unsplit.parameters) * Math.log(n)
  }
  let best = 0
  let bestScore = unsplit.chiSquare
  for (const linewidths of SPLIT_GRID_LINEWIDTHS) {
    const splitFsr = linewidths / finesse
    if (splitFsr > limit) break
    const trial = score(splitFsr)
    if (trial < bestScore) {
      best = splitFsr
      bestScore = trial
    }
  }
  if (best === 0) return 0
  return goldenSectionMinimum(score, Math.max(0.5 / finesse, best / 2), Math.min(limit, best * 2), 8)
}

/** Difference of the transverse evidence (Σ z² over orders ≥ 1) that settles a direction: about 3σ (common practice). */
const DIRECTION_EVIDENCE = 9

/**
 * The sweep direction from the line model when the resonances found leave it open. For each direction every order
 * is fitted at its predicted places (the matched filter over all FSRs); the evidence is Σ z² over orders ≥ 1 with
 * z the summed height over its standard error, counting only positive z (a power cannot be negative). The direction
 * whose evidence is higher by DIRECTION_EVIDENCE wins and its assignment is redone with that direction imposed;
 * otherwise the assignment's own choice stands. Null when the line model cannot be set up.
 */
function directionByLineModel<O extends { assignment: OrderAssignment; calibration: SweepCalibration; gouy: number }>(
  inputFor: (direction: 'up' | 'down', outcome: O) => ShareInputs,
  outcome: O,
  assignAndRefine: (directions: ('up' | 'down')[]) => O,
): { outcome: O; evidence: string } | null {
  // When the orders' places mirror onto one another (ψ near a simple fraction of π) the two directions put lines
  // at the same places with the orders swapped: the line model has nothing to add to the assignment's prior.
  const probe = inputFor(outcome.assignment.direction, outcome)
  const offsets = probe.orders.filter((order) => order > 0).map((order) => transverseOffsetFsr(order, probe.gouy))
  const near = Math.max(2 / probe.finesse, 1e-3)
  const circular = (d: number) => Math.abs(d - Math.round(d))
  if (offsets.every((a) => offsets.some((b) => circular(a + b) <= near))) return null
  const evidence = (['up', 'down'] as const).map((d) => {
    // Each direction at its own refined calibration and Gouy phase.
    const own = d === outcome.assignment.direction ? outcome : assignAndRefine([d])
    const input = inputFor(d, own)
    if (input.orders.length < 2) return null
    const problem = lineProblem(input)
    // All samples: the weak lines need every one of them (the coarse set would cost √stride in significance).
    const on = problem.all
    if (on.y.length <= problem.lines.length + 3) return null
    const fit = fitOrderPowers(on.y, on.nu, problem.lines, {
      finesse: input.finesse,
      sidebands: input.sidebands,
      sigmaV: input.sigmaV,
      supportLinewidths: SUPPORT_LINEWIDTHS,
      stepFsr: on.stepFsr,
      background: on.background,
      areaLinewidths: 0,
    })
    // A model that does not follow the data (split, ringing or distorted lines) cannot tell the directions apart;
    // a moderate misfit widens the errors by √χ²ᵥ (common practice).
    if (!(fit.reducedChiSquare <= MAX_MODEL_CHI_SQUARE)) return null
    const widen = Math.sqrt(Math.max(1, fit.reducedChiSquare))
    const z = input.orders
      .filter((order) => order > 0)
      .map((order) => {
        const { heightSum, heightVariance } = orderHeightSums(problem.lines, fit, order)
        return { order, z: heightVariance > 0 ? heightSum / (widen * Math.sqrt(heightVariance)) : 0 }
      })
    return { direction: d, own, total: z.reduce((sum, o) => sum + Math.max(0, o.z) ** 2, 0), z }
  })
  if (!evidence[0] || !evidence[1]) return null
  const [up, down] = evidence as NonNullable<(typeof evidence)[number]>[]
  const winner = up.total >= down.total ? up : down
  const loser = winner === up ? down : up
  const meaning = (d: 'up' | 'down') => (d === 'up' ? 'optical frequency rises with time' : 'optical frequency falls with time')
  const strongest = winner.z.reduce((a, b) => (b.z > a.z ? b : a))
  if (winner.total - loser.total < DIRECTION_EVIDENCE) {
    return {
      outcome,
      evidence: `${outcome.assignment.directionEvidence} The weak lines measured at their predicted places over every FSR do not decide it either (evidence ${fmt(up.total)} for up, ${fmt(down.total)} for down).`,
    }
  }
  return {
    outcome: winner.own,
    evidence: `No transverse resonance settled the direction on its own; measured at their predicted places over every FSR, the transverse orders stand out for ${winner.direction} (${meaning(winner.direction)}): order ${strongest.order} at ${fmt(strongest.z)}σ, evidence ${fmt(winner.total)} against ${fmt(loser.total)} for ${loser.direction}.`,
  }
}

function measureOrderShares(input: ShareInputs): Shares {
  const { finesse } = input
  // Without a sign of split orders the windows need no room for them (see the split search below).
  const narrow = lineProblem({ ...input, splitReachFsr: 0 })
  let { all, coarse } = narrow
  let lines = narrow.lines
  let reachFsr = 0
  // The shared linewidth is refined with the heights: every line of every order, their sidebands and the wings
  // of their neighbours share one Airy width on the calibrated axis, so the finesse comes from all of them and
  // not from TEM00 fits that see the neighbours' wings as baseline. The samples stay the same at every trial
  // (support fixed in FSR), so the residuals compare.
  // Sideband power is refined too, in turn with the width (coordinate descent): sidebands closer than a few
  // linewidths blur into the carrier and trade off with the width; farther ones lie outside the TEM00 fits.
  // The search runs on the coarse samples; the final fit uses all.
  const fitWith = (f: number, sidebands: ShareInputs['sidebands'], on = coarse, residualOnly = on === coarse, modelLines = lines) =>
    fitOrderPowers(on.y, on.nu, modelLines, {
      finesse: f,
      sidebands,
      sigmaV: input.sigmaV,
      // Every sample of the windows is modelled, whatever the split: the residuals then compare across splits.
      supportLinewidths: (SUPPORT_LINEWIDTHS / finesse + 2 * reachFsr) * f,
      stepFsr: on.stepFsr,
      background: on.background,
      residualOnly,
    })
  let sidebands = input.sidebands
  let fittedFinesse = parabolicMinimum((f) => fitWith(f, sidebands).reducedChiSquare, finesse, 0.85 * finesse, 1.18 * finesse)
  if (sidebands) {
    for (let round = 0; round < 2; round++) {
      const base: { offsetFsr: number; ratio: number } = sidebands
      const ratio = goldenSectionMinimum((r) => fitWith(fittedFinesse, { ...base, ratio: r - 1e-3 }).reducedChiSquare, 1e-3, 2 * base.ratio + 0.1, 11) - 1e-3
      sidebands = { ...base, ratio: Math.max(0, ratio) }
      fittedFinesse = parabolicMinimum((f) => fitWith(f, sidebands).reducedChiSquare, finesse, 0.85 * finesse, 1.18 * finesse)
    }
  }
  // Split orders leave the unsplit model short of the data about the transverse lines only (see
  // transverseMisfit). Only then are splits tried, on windows widened to hold them.
  let splitFsr = 0
  if (input.splitReachFsr && input.splitReachFsr > 0 && transverseMisfit(coarse, lines, (on) => fitWith(fittedFinesse, sidebands, on, true), Math.min(8 / fittedFinesse, 0.1))) {
    const wide = lineProblem(input)
    const previous = { all, coarse, reachFsr }
    ;({ all, coarse } = wide)
    reachFsr = input.splitReachFsr
    const found = searchSplit(wide, input, (candidate) => {
      const fit = fitWith(fittedFinesse, sidebands, coarse, true, candidate)
      return { chiSquare: fit.reducedChiSquare * (coarse.y.length - candidate.length - 3), parameters: candidate.length }
    }, fittedFinesse)
    if (found > 0) {
      splitFsr = found
      lines = splitLines(wide.lines, wide.predictedNu, found)
      fittedFinesse = parabolicMinimum((f) => fitWith(f, sidebands).reducedChiSquare, fittedFinesse, 0.85 * finesse, 1.18 * finesse)
    } else {
      ;({ all, coarse, reachFsr } = previous)
    }
  }
  const { y } = all
  if (coarse.y.length < y.length) {
    // The coarse samples place the minimum to about a percent; one parabola through all samples at ±1.5 %
    // takes the rest of the information (every sample counts for the width).
    const h = 0.015
    const at = (f: number) => fitWith(f, sidebands, all, true).reducedChiSquare
    const [fm, f0, fp] = [at(fittedFinesse * Math.exp(-h)), at(fittedFinesse), at(fittedFinesse * Math.exp(h))]
    const curvature = fp - 2 * f0 + fm
    if (curvature > 0) fittedFinesse *= Math.exp(Math.min(h, Math.max(-h, (-h * (fp - fm)) / (2 * curvature))))
  }
  const fit = fitWith(fittedFinesse, sidebands, all)
  const useHeight = input.preferHeight && fit.reducedChiSquare <= MAX_LINE_CHI_SQUARE
  const m = lines.length
  // Per order: the summed heights with their covariance (the matched filter: the best detector in white noise)
  // and the summed areas with their own errors (areas of separate windows taken as independent, common practice).
  const sums = new Map<number, { value: number; variance: number; heightSum: number; heightVariance: number }>()
  for (const order of input.orders) {
    const { heightSum, heightVariance } = orderHeightSums(lines, fit, order)
    let areaSum = 0
    let areaVariance = 0
    for (let j = 0; j < m; j++) {
      if (!lines[j].counted || lines[j].order !== order) continue
      areaSum += fit.lines[j].areaHeightV
      areaVariance += fit.lines[j].areaHeightErrorV ** 2
    }
    sums.set(order, useHeight
      ? { value: heightSum, variance: heightVariance, heightSum, heightVariance }
      : { value: areaSum, variance: areaVariance, heightSum, heightVariance })
  }
  // Report an order (always TEM00) when the lines at its places stand out of the noise by the matched filter or
  // by their area, and the measure used is positive.
  const significant = (value: number, variance: number) => value > REPORT_SIGNIFICANCE * Math.sqrt(Math.max(variance, 0))
  const reported = input.orders.filter((order) => {
    const s = sums.get(order)!
    return order === 0 ? s.value > 0 : s.value > 0 && (significant(s.heightSum, s.heightVariance) || significant(s.value, s.variance))
  })
  // The total counts every order measured, reported or not: leaving out the orders below the noise would push the
  // TEM00 fraction up by their power (their estimates average to their true power, zero for an empty order).
  let total = 0
  for (const order of input.orders) total += sums.get(order)!.value
  if (!(sums.get(0)!.value > 0) || !(total > 0)) throw new EngineError('no_resonances', 'No carrier resonance could be measured in the selected sweep')
  const orders: Record<string, number> = {}
  for (const order of reported) orders[String(order)] = sums.get(order)!.value / total
  let belowNoise = 0
  for (const order of input.orders) if (!reported.includes(order)) belowNoise += sums.get(order)!.value / total
  const fundamentalFraction = Math.min(1, orders['0'] ?? 0)
  // First-order error propagation of P_N / Σ P (Bevington & Robinson, "Data Reduction and Error Analysis", §3.2):
  // with heights, through the full covariance of the line heights (the slow background they share correlates
  // them); with areas, orders taken as independent (common practice).
  const shareError = (order: number): number => {
    const share = sums.get(order)!.value / total
    let variance = 0
    if (useHeight) {
      const gradient = lines.map((l) => (l.counted && input.orders.includes(l.order) ? ((l.order === order ? 1 : 0) - share) / total : 0))
      for (let j = 0; j < m; j++) {
        if (gradient[j] === 0) continue
        for (let l = 0; l < m; l++) if (gradient[l] !== 0) variance += gradient[j] * fit.covariance[j * m + l] * gradient[l]
      }
    } else {
      for (const other of input.orders) variance += (((other === order ? 1 : 0) - share) / total) ** 2 * Math.max(sums.get(other)!.variance, 0)
    }
    return Math.sqrt(Math.max(variance, 0))
  }
  const orderEstimates = input.orders.map((order) => {
    const s = sums.get(order)!
    return {
      order,
      share: s.value / total,
      shareError: shareError(order),
      significance: s.variance > 0 ? s.value / Math.sqrt(s.variance) : null,
      reported: reported.includes(order),
    }
  })
  const fundamentalError = orderEstimates.find((e) => e.order === 0)!.shareError
  const tolerance = Math.max(3 / finesse, 0.005)
  return {
    orders,
    fundamentalFraction,
    fundamentalFractionError: Number.isFinite(fundamentalError) ? fundamentalError : null,
    splitFsr,
    belowNoiseShare: belowNoise,
    orderEstimates: orderEstimates.map((e) => ({ ...e, shareError: Number.isFinite(e.shareError) ? e.shareError : null, significance: e.significance !== null && Number.isFinite(e.significance) ? e.significance : null })),
    measure: useHeight ? 'height' : 'area',
    reducedChiSquare: Number.isFinite(fit.reducedChiSquare) ? fit.reducedChiSquare : null,
    finesse: Number.isFinite(fit.reducedChiSquare) ? fittedFinesse : null,
    shareOfPeak: (order, positionFsr) => {
      if (!(String(order) in orders)) return 0
      for (let j = 0; j < m; j++) {
        if (lines[j].order !== order || !lines[j].counted || Math.abs(lines[j].nu - positionFsr) > tolerance) continue
        return (useHeight ? fit.lines[j].heightV : fit.lines[j].areaHeightV) / total
      }
      return 0
    },
  }
}

/**
 * Minimum of a smooth function near x0 on a log scale by successive parabolas through three points (inverse
 * parabolic interpolation, Press et al., "Numerical Recipes", §10.2): a bracket of ±6 % walked towards the lower
 * side until it holds the minimum, then a parabola, then a second one at a quarter of the spacing. About seven
 * evaluations, against a dozen for a golden-section search to the same precision. Kept within [lo, hi].
 */
function parabolicMinimum(f: (x: number) => number, x0: number, lo: number, hi: number): number {
  const a = Math.log(lo)
  const b = Math.log(hi)
  const at = (u: number) => f(Math.exp(Math.min(b, Math.max(a, u))))
  const vertex = (u: number, h: number, fm: number, f0: number, fp: number) => {
    const curvature = fp - 2 * f0 + fm
    if (!(curvature > 0)) return fm < fp ? u - h : u + h
    return Math.min(u + h, Math.max(u - h, u - (h * (fp - fm)) / (2 * curvature)))
  }
  let h = 0.06
  let u = Math.log(x0)
  let fm = at(u - h)
  let f0 = at(u)
  let fp = at(u + h)
  for (let step = 0; step < 3 && !(f0 <= fm && f0 <= fp); step++) {
    if (fm < fp) {
      u -= h
      fp = f0
      f0 = fm
      fm = at(u - h)
    } else {
      u += h
      fm = f0
      f0 = fp
      fp = at(u + h)
    }
  }
  u = vertex(u, h, fm, f0, fp)
  h /= 4
  u = vertex(u, h, at(u - h), at(u), at(u + h))
  return Math.exp(Math.min(b, Math.max(a, u)))
}

/**
 * Minimum of a unimodal function on [a, b] by golden-section search, on a log scale (Press et al., "Numerical
 * Recipes", §10.2 (Kiefer's method)); `iterations` steps shrink the bracket by 0.618 each.
 */
function goldenSectionMinimum(f: (x: number) => number, a: number, b: number, iterations: number): number {
  const g = (Math.sqrt(5) - 1) / 2
  let lo = Math.log(a)
  let hi = Math.log(b)
  let x1 = hi - g * (hi - lo)
  let x2 = lo + g * (hi - lo)
  let f1 = f(Math.exp(x1))
  let f2 = f(Math.exp(x2))
  for (let k = 0; k < iterations; k++) {
    if (!(f1 <= f2) && Number.isFinite(f2)) {
      lo = x1
      x1 = x2
      f1 = f2
      x2 = lo + g * (hi - lo)
      f2 = f(Math.exp(x2))
    } else {
      hi = x2
      x2 = x1
      f2 = f1
      x1 = hi - g * (hi - lo)
      f1 = f(Math.exp(x1))
    }
  }
  return Math.exp(f1 <= f2 ? x1 : x2)
}

/** ν at every `cell`-th sample (and the last), ν = Σ cₖ uᵏ with u = u0 + i·du. */
function gridFrequencies(n: number, cell: number, u0: number, du: number, c: number[]): Float64Array {
  const cellCount = Math.ceil((n - 1) / cell)
  const gridNu = new Float64Array(cellCount + 1)
  for (let g = 0; g <= cellCount; g++) {
    const u = u0 + Math.min(n - 1, g * cell) * du
    let v = 0
    for (let k = c.length - 1; k >= 0; k--) v = v * u + c[k]
    gridNu[g] = v
  }
  return gridNu
}

/**
 * The samples within `support` of some line centre (whole grid cells whose ν range, widened by half its span for
 * curvature, meets a line's support) and inside [windowLo, windowHi], with their ν and their width on the ν axis.
 */
function samplesNearLines(
  raw: Float64Array,
  darkLevelV: number,
  cell: number,
  gridNu: Float64Array,
  centres: Float64Array,
  support: number,
  u0: number,
  du: number,
  c: number[],
  windowLo = -Infinity,
  windowHi = Infinity,
): { y: Float64Array; nu: Float64Array; stepFsr: Float64Array; x: Float64Array } {
  const n = raw.length
  const cellCount = gridNu.length - 1
  const take = new Uint8Array(cellCount)
  let total = 0
  for (let g = 0; g < cellCount; g++) {
    const a0 = Math.min(gridNu[g], gridNu[g + 1])
    const b0 = Math.max(gridNu[g], gridNu[g + 1])
    const a = a0 - 0.5 * (b0 - a0) - support
    const b = b0 + 0.5 * (b0 - a0) + support
    // First line centre at or above a; the cell is reached when it lies at or below b.
    let l = 0
    let h = centres.length
    while (l < h) {
      const mid = (l + h) >> 1
      if (centres[mid] < a) l = mid + 1
      else h = mid
    }
    if (l < centres.length && centres[l] <= b) {
      take[g] = 1
      total += (g + 1 === cellCount ? n : (g + 1) * cell) - g * cell
    }
  }
  const y = new Float64Array(total)
  const nu = new Float64Array(total)
  const stepFsr = new Float64Array(total)
  const x = new Float64Array(total)
  let w = 0
  for (let g = 0; g < cellCount; g++) {
    if (!take[g]) continue
    const end = g + 1 === cellCount ? n : (g + 1) * cell
    for (let i = g * cell; i < end; i++) {
      const u = u0 + i * du
      let v = 0
      let d = 0
      for (let k = c.length - 1; k >= 0; k--) {
        d = d * u + v
        v = v * u + c[k]
      }
      if (v < windowLo || v > windowHi) continue
      y[w] = raw[i] - darkLevelV
      x[w] = n > 1 ? (2 * i) / (n - 1) - 1 : 0
      nu[w] = v
      stepFsr[w] = Math.abs(d * du)
      w++
    }
  }
  return w === total ? { y, nu, stepFsr, x } : { y: y.subarray(0, w), nu: nu.subarray(0, w), stepFsr: stepFsr.subarray(0, w), x: x.subarray(0, w) }
}

/**
 * Sweep speed s = r / (π δν²) (see SWEEP_SPEED_RINGING) and the field decay time τ = 1/(π δν): r from the FSR in
 * Hz over the median TEM00 spacing in seconds, δν the narrower of the measured and the design linewidth (ringing
 * widens the measured one).
 */
function sweepSpeedOf(calibration: SweepCalibration | null, model: CavityModel, measuredFinesse: number | null): { speed: number; decaySeconds: number } | null {
  if (!calibration || !(calibration.fsrSeconds > 0)) return null
  const finesses = [measuredFinesse, model.designFinesse].filter((f): f is number => f !== null && f > 0)
  if (finesses.length === 0) return null
  const linewidthHz = model.fsrHz / Math.max(...finesses)
  return { speed: model.fsrHz / calibration.fsrSeconds / (Math.PI * linewidthHz * linewidthHz), decaySeconds: 1 / (Math.PI * linewidthHz) }
}

/** TEM00 resonances fitted for their ring-down, at most (the median of a few is enough). */
const RINGDOWN_FITS = 5

/**
 * The finesse from the ring-down of the TEM00 resonances (fitRingdown with the sweep rate of the calibration):
 * 𝓕 = π·τ·FSR, since δν = 1/(πτ). Each fit spans 20 apparent linewidths before the resonance and 20 linewidths
 * plus 15 decay times after it, stopping half-way to any other resonance found. The median of the converged fits,
 * with the spread of their values (or, for fewer than three, the larger fit error) as the error; null when none
 * converges.
 */
function finesseFromRingdown(input: {
  signal: Float64Array
  measured: MeasuredResonance[]
  members: number[]
  lobes: Map<number, number>
  calibration: SweepCalibration
  tOf: (m: MeasuredResonance) => number
  startSeconds: number
  dt: number
  sigmaV: number
  fsrHz: number
  apparentFinesse: number
}): { value: number; error: number | null } | null {
  const { signal, measured, calibration, tOf, dt, fsrHz } = input
  const others = measured.map((m, i) => ({ t: tOf(m), i })).filter(({ i }) => !input.lobes.has(i)).sort((a, b) => a.t - b.t)
  const tallest = input.members.slice().sort((a, b) => measured[b].heightV - measured[a].heightV).slice(0, RINGDOWN_FITS)
  const values: { finesse: number; error: number }[] = []
  for (const k of tallest) {
    const center = tOf(measured[k])
    const rateHzPerSecond = Math.abs(sweepRateAt(calibration, center)) * fsrHz
    if (!(rateHzPerSecond > 0)) continue
    const apparentLinewidthSeconds = fsrHz / input.apparentFinesse / rateHzPerSecond
    // The ringing widens the line: the true decay time is longer than the apparent linewidth says.
    const decayGuess = 2 / (Math.PI * (fsrHz / input.apparentFinesse))
    let from = center - 20 * apparentLinewidthSeconds
    let to = center + 20 * apparentLinewidthSeconds + 15 * decayGuess
    for (const o of others) {
      if (o.i === k) continue
      if (o.t < center) from = Math.max(from, (o.t + center) / 2)
      else to = Math.min(to, (o.t + center) / 2)
    }
    const a = Math.max(0, Math.ceil((from - input.startSeconds) / dt))
    const b = Math.min(signal.length, Math.floor((to - input.startSeconds) / dt))
    if (b - a < 20) continue
    const t = Float64Array.from({ length: b - a }, (_, j) => input.startSeconds + (a + j) * dt)
    const fit = fitRingdown(t, signal.subarray(a, b), { rateHzPerSecond, guess: { centerSeconds: center, heightV: measured[k].heightV, decaySeconds: decayGuess }, sigmaV: input.sigmaV })
    if (!fit || !(fit.reducedChiSquare <= MAX_MODEL_CHI_SQUARE)) continue
    values.push({ finesse: Math.PI * fit.decaySeconds * fsrHz, error: Math.PI * fit.decayErrorSeconds * fsrHz })
  }
  if (values.length === 0) return null
  const value = median(values.map((v) => v.finesse))
  const error = values.length > 2 ? (1.4826 * median(values.map((v) => Math.abs(v.finesse - value)))) / Math.sqrt(values.length) : Math.max(...values.map((v) => v.error))
  return { value, error: Number.isFinite(error) ? error : null }
}

/**
 * Ring-down lobes: after a fast crossing the transmitted light beats for a few decay times (Poirson et al.,
 * J. Opt. Soc. Am. B 14, 2811 (1997)), and a beat can stand out as a resonance of its own. A resonance that
 * follows a taller one of the same order and kind within four decay times (intensity e⁻⁸ of the start) is such
 * a lobe: one order cannot resonate twice so close.
 */
function ringLobes(measured: MeasuredResonance[], labels: OrderLabel[], tOf: (m: MeasuredResonance) => number, decaySeconds: number): Map<number, number> {
  const lobes = new Map<number, number>()
  const order = measured.map((_, i) => i).sort((a, b) => tOf(measured[a]) - tOf(measured[b]))
  for (let a = 0; a < order.length; a++) {
    const i = order[a]
    if (lobes.has(i) || labels[i].kind === 'unassigned') continue
    for (let b = a + 1; b < order.length; b++) {
      const j = order[b]
      if (tOf(measured[j]) - tOf(measured[i]) > 4 * decaySeconds) break
      if (labels[j].kind === labels[i].kind && labels[j].order === labels[i].order && measured[j].heightV < measured[i].heightV) lobes.set(j, i)
    }
  }
  return lobes
}

/** Without two TEM00 resonances nothing else can be placed: TEM00 is all that is counted. */
/**
 * Without two TEM00 resonances the sweep cannot be calibrated, so no resonance can be given an order. The TEM00
 * fraction is then the TEM00 resonances' integrated power against all resonance power seen in the sweep: a rough
 * figure (the sweep may hold more or less than one FSR of transverse modes), flagged by `single_fundamental`.
 */
function fundamentalOnlyShares(measured: MeasuredResonance[], members: number[]): Shares {
  const isFundamental = new Set(members)
  let fundamental = 0
  let all = 0
  for (let k = 0; k < measured.length; k++) {
    const area = Math.max(0, measured[k].areaVSamples)
    all += area
    if (isFundamental.has(k)) fundamental += area
  }
  const fraction = all > 0 ? fundamental / all : 1
  return {
    orders: { '0': fraction },
    fundamentalFraction: fraction,
    fundamentalFractionError: null,
    measure: 'area',
    reducedChiSquare: null,
    finesse: null,
    belowNoiseShare: 0,
    orderEstimates: [],
    splitFsr: 0,
    shareOfPeak: (order) => (order === 0 && members.length > 0 ? fraction / members.length : 0),
  }
}

function orientedFraction(positionFsr: number, direction: 'up' | 'down' | 'unknown'): number {
  return direction === 'down' ? frac(-positionFsr) : frac(positionFsr)
}

function indexRange(trace: Trace, part: { startTime: number; endTime: number }): { startIndex: number; endIndex: number } {
  if (!(part.endTime > part.startTime)) {
    throw new EngineError('invalid_sweep_part', `sweepPart.endTime (${part.endTime}) must be after startTime (${part.startTime})`)
  }
  return {
    startIndex: Math.ceil((part.startTime - trace.startTime) / trace.sampleInterval),
    endIndex: Math.floor((part.endTime - trace.startTime) / trace.sampleInterval) + 1,
  }
}

function assertVaries(values: Float64Array): void {
  if (!(spanOf(values) > 0)) {
    throw new EngineError('constant_signal', 'The transmission signal is constant: no resonances can be found')
  }
}

function spanOf(values: Float64Array): number {
  let lo = Infinity
  let hi = -Infinity
  for (let i = 0; i < values.length; i++) {
    const v = values[i]
    if (v < lo) lo = v
    if (v > hi) hi = v
  }
  return hi - lo
}

function median(values: number[]): number {
  if (values.length === 0) return NaN
  const s = values.slice().sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2
}

function frac(x: number): number {
  return x - Math.floor(x)
}

function fmt(x: number): string {
  return Number.isFinite(x) ? x.toFixed(1) : 'n/a'
}
