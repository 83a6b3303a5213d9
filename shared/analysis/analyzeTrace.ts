import { computeCavityModel, transverseOffsetFsr, type CavityGeometry } from '../cavity'
import { type EngineWarning } from '../errors'
import type { Trace } from '../trace/types'
import { selectSweep } from '../sweep/selectSweep'
import { findSweepInData } from '../sweep/findSweepInData'
import { indexRange } from '../sweep/indexRange'
import { assertVaries, prepareSignal, type PreparedSignal } from '../peaks/prepareSignal'
import { tallResonances } from '../peaks/tallResonances'
import { findAllResonances } from '../peaks/findAllResonances'
import { foldFastStructure, foldLobes } from '../peaks/foldFastStructure'
import type { MeasuredResonance } from '../peaks/measureResonances'
import { finesseFrom, fitFundamentals } from '../peaks/fitFundamentals'
import { calibrateSweep, frequencyAt, type SweepCalibration } from '../calibration/calibrateSweep'
import { fsrOnTimeAxis } from '../calibration/fsrOnTimeAxis'
import { calibrateWithOrders } from '../calibration/calibrateWithOrders'
import { chooseComb, unlessLadder } from '../orders/chooseComb'
import { orderFamilies } from '../orders/orderFamilies'
import { assignOrders, type OrderLabel } from '../orders/assignOrders'
import { directionByLineModel } from '../orders/directionByLineModel'
import { MAX_LINE_CHI_SQUARE, MAX_MODEL_CHI_SQUARE, measureOrderShares } from '../orders/measureOrderShares'
import { fundamentalOnlyShares, peakAreaShares } from '../orders/peakAreaShares'
import { readSpectrum } from '../orders/readSpectrum'
import { countingWindow } from '../orders/countingWindow'
import { frac, fmt, median } from '../numbers'
import { finesseFromRingdown, ringLobes, sweepSpeedOf } from './finesseFromRingdown'
import { pickChannels } from './pickChannels'
import { readingOfShares } from './readingOfShares'
import { collectWarnings, SWEEP_SPEED_RINGING } from './collectWarnings'
import { transverseHeight, measuredOrders, measureOrSkip, orientedFraction, pipelineWarnings } from './pipelineHelpers'
import { weakOrderPhase } from './weakOrderPhase'
import { readingDoubts, unsteadyOrder, unassignedShareOf } from './readingDoubts'
import { familiesDisagree, lowOrderMergedWithTem00 } from './readingChecks'
import type { AnalysisPeak, AnalysisResult, AnalyzeOptions } from './types'

/** Highest transverse order the assignment considers. */
const MAX_ORDER = 10
/** Orders always measured at their predicted places, detected or not (the ones that tell the mode-match). */
const ALWAYS_MEASURED_ORDERS = 4
/**
 * … and up to this order when the beam is far from matched (the reading puts less than 80 % in TEM00): a badly
 * misaligned or mismatched beam spreads its power over many orders, each below the noise in one FSR but together
 * worth points of the fraction (a misalignment's Poisson tail; Anderson, Appl. Opt. 23, 2944 (1984), from memory).
 */
const POOR_MATCH_MEASURED_ORDERS = 8
/** Below this finesse the line model is not set up (the search ranges reach below 1; lines overlap into a continuum). */
const MIN_MODEL_FINESSE = 3
/** A peak is labelled on its own when its height stands this many σ above the noise (5σ, common practice). */
const LABEL_SIGNIFICANCE = 5
/** … or this many σ when its order is reported (the matched filter over all FSRs finds it). */
const REPORT_SIGNIFICANCE_PEAK = 3
/** A reading's mirror image must cost this much more (in units of the tallest resonance's height) to settle the direction. */
const DIRECTION_COST = 0.03

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

  // 3–4. The tall resonances give the TEM00 linewidth; smoothed at half of it, every resonance is found and measured.
  const { tall, roughWidth, measured: found } = findAllResonances(signal, sigmaV, { model: peakModel === 'airy' ? 'airy' : 'lorentzian' })
  const tOf = (m: MeasuredResonance) => timeAt(sweep.startIndex + m.centerIndex)
  // Periodic fast structure after each resonance (a detector that rings) is folded into the resonance it follows:
  // its lobes are no resonances of the cavity and must never be read as a comb.
  // (Spike trains of a dither were recognised among the tall resonances already and are measured by area.)
  const structure = tall.spikeTrains
    ? { ownerOf: new Map<number, number>(), periodSeconds: null, kind: null }
    : foldFastStructure(found.map((m) => ({ tSeconds: tOf(m), heightV: m.heightV, widthSeconds: m.fwhmSamples * dt })), { sigmaV })
  const measured = structure.ownerOf.size ? foldLobes(found, structure.ownerOf) : found

  // 5. Reading: which family is TEM00, the sweep direction and the Gouy phase, from the whole pattern (any family
  // that repeats one FSR later calibrates the sweep). Without a repeat, the tallest comb is all there is.
  const sidebandOffsetFsr = modulationMHz ? (modulationMHz * 1e6) / model.fsrHz : null
  const families0 = orderFamilies(predictedGouy, MAX_ORDER, 0.005)
  const tallestComb = unlessLadder(chooseComb(measured, tOf, predictedGouy, families0.leaders, sidebandOffsetFsr, roughWidth, MAX_ORDER), measured, predictedGouy, signal.length, families0.leaders, roughWidth)
  const readings = readSpectrum(
    measured.map((m) => ({ tSeconds: tOf(m), heightV: m.heightV, widthSeconds: m.fwhmSamples * dt })),
    {
      predictedGouyRad: predictedGouy,
      sigmaV,
      sidebandOffsetFsr: sidebandOffsetFsr === null ? null : frac(sidebandOffsetFsr),
      startSeconds: timeAt(sweep.startIndex),
      endSeconds: timeAt(sweep.endIndex - 1),
      directions: options.sweepDirection ? [options.sweepDirection] : undefined,
      comb: tallestComb,
    },
  )
  const reading = readings[0] ?? null
  // A Gouy phase read from a poorly calibrated sweep (TEM00 off its whole numbers by more than 0.5 % of an FSR) is
  // not trusted to overrule the geometry: the assignment then starts from the prediction, as on a TEM00 comb.
  const gouyFromData = reading !== null && reading.calibration.residualRmsFsr <= 0.005
  const readingGouy = gouyFromData ? reading.gouyRad : predictedGouy
  const comb = reading ? { members: reading.fundamentals, fsrIndex: reading.fsrIndex } : tallestComb
  let calibration: SweepCalibration | null = reading?.calibration ?? null
  if (!calibration && comb.members.length >= 2) calibration = calibrateSweep(comb.members.map((k) => tOf(measured[k])), comb.fsrIndex)

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

  // The stretch over which orders are counted: whole periods between TEM00, or one FSR when a single TEM00 is in view.
  const windowOf = (cal: SweepCalibration, d: 'up' | 'down', psi: number) => {
    const sign = d === 'up' ? 1 : -1
    const offsets = families0.leaders.filter((order) => order > 0 && order <= ALWAYS_MEASURED_ORDERS).map((order) => sign * transverseOffsetFsr(order, psi))
    const w = countingWindow(comb.fsrIndex, [frequencyAt(cal, timeAt(sweep.startIndex)), frequencyAt(cal, timeAt(sweep.endIndex - 1))], offsets, sweep.endIndex - sweep.startIndex)
    return w ? { firstIndex: w.first, lastIndex: w.last } : { firstIndex: 0, lastIndex: 0 }
  }

  // 7. Orders: families of degenerate orders, assignment, then the calibration refined with every carrier.
  const toleranceFsr = Math.min(0.06, Math.max(0.02, 4 * linewidthFsr))
  const families = orderFamilies(readingGouy, MAX_ORDER, Math.max(2 * linewidthFsr, 0.005))
  const isFundamental = new Set(comb.members)
  let labels: OrderLabel[]
  let direction: 'up' | 'down' | 'unknown' = 'unknown'
  let directionEvidence = 'Fewer than two TEM00 resonances: the optical sweep direction is unknown.'
  let gouy = readingGouy
  let gouyFolded = false
  let gouyMirrored = false
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
    const pinned = comb.members.length >= 3 || (reading !== null && reading.calibratingLinks >= 2)
    const maxShift = pinned ? 0.03 * readingGouy : 0
    const assignAndRefine = (directions: ('up' | 'down')[]) => {
      let cal = firstCalibration
      let psi = readingGouy
      let assignment = assign(cal, psi, toleranceFsr, maxShift, directions)
      for (let round = 0; round < 2; round++) {
        const points = measured
          .map((m, i) => ({ m, l: assignment.labels[i] }))
          .filter(({ l }, i) => l.kind === 'carrier' && l.order !== null && votes(i))
          .map(({ m, l }) => ({ tSeconds: tOf(m), order: l.order!, weight: Math.min(m.heightV / sigmaV, 200) ** 2 }))
        const refined = calibrateWithOrders(points, cal, assignment.direction, readingGouy, { maxGouyShiftRad: maxShift, outlierFsr: Math.max(1e-4, 0.5 * linewidthFsr) })
        const tight = (c: SweepCalibration, p: number) => assign(c, p, Math.min(toleranceFsr, Math.max(0.01, 3 * linewidthFsr)), 1e-3 * readingGouy, directions)
        const next = tight(refined.calibration, refined.gouyRad)
        // A refinement that loses most of the transverse height the map it started from labels (judged as tightly) went
        // astray: a low-degree polynomial may undo a bend of the sweep that the families' links had measured.
        const kept = tight(cal, psi)
        if (transverseHeight(next.labels, measured) < 0.5 * transverseHeight(kept.labels, measured)) return { assignment: kept, calibration: cal, gouy: psi }
        cal = refined.calibration
        psi = refined.gouyRad
        assignment = next
      }
      return { assignment, calibration: cal, gouy: psi }
    }
    // The reading decides the direction when its mirror image (same TEM00, other direction) explains the resonances
    // clearly worse; otherwise the weak lines are asked (below).
    const mirror = reading ? readings.find((r) => r.direction !== reading.direction && r.fundamentals.join() === reading.fundamentals.join()) : undefined
    // When the orders' places mirror onto one another (ψ a simple fraction of π: orders N and M − N swap), positions
    // cannot settle it whatever the costs say: the assignment's low-order prior decides, and says so.
    const offsets = families.leaders.filter((order) => order > 0 && order <= ALWAYS_MEASURED_ORDERS).map((order) => transverseOffsetFsr(order, readingGouy))
    const selfMirrored = offsets.every((a) => offsets.some((b) => Math.abs(a + b - Math.round(a + b)) <= 0.005))
    const readingSettles = reading !== null && (options.sweepDirection !== undefined || ((!mirror || mirror.cost - reading.cost >= DIRECTION_COST) && !selfMirrored))
    let outcome = assignAndRefine(reading && readingSettles ? [reading.direction] : options.sweepDirection ? [options.sweepDirection] : ['up', 'down'])
    directionEvidence = reading && readingSettles && !options.sweepDirection
      ? `The resonances' places decide it: read as ${reading.direction} (${reading.direction === 'up' ? 'optical frequency rises with time' : 'optical frequency falls with time'}), the orders stand at their N·ψ/π places${mirror ? `; read the other way they explain ${fmt(100 * Math.min(1, mirror.cost - reading.cost))} % of the tallest resonance's height less` : ''}.`
      : outcome.assignment.directionEvidence
    if (!readingSettles && !options.sweepDirection && !outcome.assignment.directionSettled && finesse) {
      // The resonances found do not settle the direction (none stood out, or the pattern is nearly symmetric):
      // measure every order at its predicted places for both directions, where the matched filter sums the weak
      // lines of every FSR, and keep the direction whose transverse lines stand out more.
      const verdict = directionByLineModel((d, o) => ({
        signal, raw: part, darkLevelV, sigmaV, calibration: o.calibration, direction: d, gouy: o.gouy, finesse: finesse!.value,
        sidebands: sidebandOffsetFsr && shapes.length ? { offsetFsr: sidebandOffsetFsr, ratio: median(shapes.map((sh) => sh.sidebandRatio)) } : null,
        orders: families.leaders.filter((order) => order <= ALWAYS_MEASURED_ORDERS), detected: [], placementToleranceFsr: 0,
        ...windowOf(o.calibration, d, o.gouy),
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
    // 7b. ψ from the weak orders summed over every FSR (weakOrderPhase), when no low order was found one by one; not
    // on lines reshaped by fast structure or a slow detector (a distorted TEM00 leaves lobes at fixed places).
    const lowOrderFound = labels.some((l) => l.kind === 'carrier' && l.order !== null && l.order > 0 && l.order <= ALWAYS_MEASURED_ORDERS)
    const speed = sweepSpeedOf(calibration, model, finesse?.value ?? null)
    const reshaped = tall.spikeTrains === true || comb.members.some((k) => measured[k].lobeCount >= 3) || structure.ownerOf.size > 0 || (speed !== null && speed.speed >= SWEEP_SPEED_RINGING)
    const weak = finesse && comb.members.length >= 2 && !lowOrderFound && !reshaped
      ? weakOrderPhase({
          signal, sigmaV, calibration, startSeconds: timeAt(sweep.startIndex), dtSeconds: dt, ...windowOf(calibration, direction, gouy),
          direction, finesse: finesse.value, predictedGouyRad: gouy, bothDirections: options.sweepDirection === undefined,
        })
      : null
    if (weak) {
      gouy = weak.gouyRad
      gouyFolded = weak.claimed
      gouyMirrored = !weak.claimed
      if (weak.evidence) directionEvidence = weak.evidence
      direction = weak.direction
      // The resonances found are labelled again at the places the phase found puts the orders.
      const again = assign(calibration, gouy, Math.min(toleranceFsr, Math.max(0.01, 3 * linewidthFsr)), 0, [weak.direction])
      labels = again.labels
      orderResidual = again.residualRmsFsr
    }
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

  const fastStructure = tall.spikeTrains === true || comb.members.some((k) => measured[k].lobeCount >= 3)
  // 8. Power per order: every order measured at its predicted place over whole FSR periods.
  const countedSpan = calibration ? windowOf(calibration, direction === 'down' ? 'down' : 'up', gouy) : null
  const window = countedSpan && countedSpan.lastIndex > countedSpan.firstIndex ? { first: countedSpan.firstIndex, last: countedSpan.lastIndex } : null
  // (With areas, each extra order adds the noise of its whole window: only heights afford the far orders.)
  const poorMatch = reading !== null && reading.roughFraction < 0.8 && samplesPerLinewidth >= 6 && !fastStructure
  const ordersMeasured = measuredOrders(families.leaders, labels, poorMatch ? POOR_MATCH_MEASURED_ORDERS : ALWAYS_MEASURED_ORDERS)
  const lineModel = (calibration: SweepCalibration, finesse: { value: number }, window: { first: number; last: number }) => measureOrderShares({
        signal, raw: part, darkLevelV, sigmaV, calibration, direction: direction === 'down' ? 'down' : 'up', gouy, finesse: finesse.value,
        sidebands: sidebandOffsetFsr && shapes.length ? { offsetFsr: sidebandOffsetFsr, ratio: median(shapes.map((s) => s.sidebandRatio)) } : null,
        orders: ordersMeasured,
        // Splits of up to 8 linewidths (at most 0.01 FSR) between neighbouring lines of an order are looked for.
        splitReachFsr: (Math.min(8 / finesse.value, 0.01) * Math.max(...ordersMeasured.filter((order) => order <= ALWAYS_MEASURED_ORDERS))) / 2,
        detected: measured
          .map((m, i) => ({ nu: positions[i], order: labels[i].kind === 'carrier' ? labels[i].order : null, heightV: m.heightV }))
          .filter((d): d is { nu: number; order: number; heightV: number } => d.order !== null && Number.isFinite(d.nu)),
        placementToleranceFsr: Math.min(toleranceFsr, Math.max(0.01, 3 * linewidthFsr)),
        firstIndex: window.first, lastIndex: window.last,
        startSeconds: timeAt(sweep.startIndex), dtSeconds: dt, samplesPerLinewidth,
        preferHeight: samplesPerLinewidth >= 6 && !fastStructure,
        quantumV,
      })
  // A finesse of a few means no line shape to model (a reading whose calibration went astray): count areas instead.
  let shares = calibration && finesse && finesse.value >= MIN_MODEL_FINESSE && window ? measureOrSkip(() => lineModel(calibration!, finesse!, window)) : null
  // No TEM00 power where the reading put it (a reading gone wrong): the resonances found are counted one by one.
  const lineModelFailed = calibration !== null && finesse !== null && window !== null && shares === null
  if (!shares) shares = (calibration && window && peakAreaShares(measured, labels, positions, calibration, [window.first, window.last], toleranceFsr, dt, tOf)) || fundamentalOnlyShares(measured, comb.members)
  // Lines that do not follow one shared shape (split, ringing or distorted resonances, a poorly followed sweep): the
  // integrated power of each resonance found, wherever it sits, instead (the model's own fraction kept to compare).
  const fallback = calibration && shares.reducedChiSquare !== null && shares.reducedChiSquare > MAX_MODEL_CHI_SQUARE ? peakAreaShares(measured, labels, positions, calibration, [window!.first, window!.last], toleranceFsr, dt, tOf) : null
  const modelFraction = fallback ? shares.fundamentalFraction : null
  if (fallback) shares = { ...fallback, reducedChiSquare: shares.reducedChiSquare }
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

  // A peak is shown with an order only when it stands out on its own (5σ, common practice for a single detection
  // among many samples) or its order stands out over all FSRs (reported by the line model) and the peak by 3σ:
  // a noise peak that happens to sit near a predicted place stays unassigned.
  const labelStands = (i: number) => {
    const l = labels[i]
    if (l.kind === 'unassigned' || l.order === null || isFundamental.has(i)) return true
    const snr = measured[i].heightV / sigmaV
    return snr >= LABEL_SIGNIFICANCE || (snr >= REPORT_SIGNIFICANCE_PEAK && String(l.order) in orders)
  }
  const peaks: AnalysisPeak[] = measured.flatMap((m, i) => {
    if (lobes.has(i)) return []
    const l: OrderLabel = labelStands(i) ? labels[i] : { kind: 'unassigned', order: null, residualFsr: NaN }
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

  const heightsCompare = samplesPerLinewidth >= 4 && !fastStructure && !structure.ownerOf.size // (well-sampled, no fast structure)
  const doubts = readingDoubts({
    readings,
    fundamentalFraction,
    cavity,
    predictedGouyRad: predictedGouy,
    measuredGouyRad: calibration && (gouyFromData || gouyFolded) && !gouyMirrored ? gouy : null,
    gouyFromWeakLines: gouyFolded,
    transverseCount: labels.filter((l) => l.kind === 'carrier' && l.order !== null && l.order > 0).length,
    directionGiven: options.sweepDirection !== undefined,
    unassignedHeightShare: unassignedShareOf(peaks),
    lineModelFailed,
    lineModelChiSquare: shares.reducedChiSquare,
    calibrated: calibration !== null,
    sweepRangeFsr: calibration ? [frequencyAt(calibration, timeAt(sweep.startIndex)), frequencyAt(calibration, timeAt(sweep.endIndex - 1))] : null,
    wholePeriodCounted: calibration === null || window !== null,
    fundamentalCount: comb.members.length,
    lineModelFraction: modelFraction,
    unsteady: heightsCompare ? unsteadyOrder(peaks, sigmaV) : null,
    familiesDisagree: heightsCompare ? familiesDisagree(peaks, sigmaV) : null,
    mergedLowOrder: calibration ? lowOrderMergedWithTem00(gouy, Math.max(linewidthFsr, (3 * dt) / Math.abs(calibration.fsrSeconds))) : null,
  })
  const warnings: EngineWarning[] = [
    ...trace.warnings,
    ...doubts.warnings,
    ...pipelineWarnings({
      // (A sweep fast enough to make the cavity ring explains such lobes itself: its own warning says so.)
      ringingDetector: structure.ownerOf.size && structure.periodSeconds && !(sweepSpeed && sweepSpeed.speed >= SWEEP_SPEED_RINGING) ? { count: structure.ownerOf.size, periodSeconds: structure.periodSeconds } : null,
      splitFsr: shares.splitFsr,
      finesse: finesse?.value ?? 0,
      ladderHeights: comb.ladderPossible ? comb.members.map((k) => measured[k].heightV) : null,
    }),
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
      linewidthFsr: shares.finesse ? 1 / shares.finesse : linewidthFsr,
      resolutionFsr: calibration ? (3 * dt) / Math.abs(calibration.fsrSeconds) : 0,
      orders,
      orderResidualRmsFsr: orderResidual,
      calibrated: calibration !== null,
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
    fsr: { ...fsrOnTimeAxis(calibration, combTimes), hz: fsrHz },
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
      ? `${doubts.warnings.some((w) => w.code === 'ambiguous_reading') ? 'This reading of the spectrum may be wrong (see the warning on an ambiguous reading); if it holds: ' : ''}${readingOfShares(fundamentalFraction, misalignmentShare, mismatchShare)}`
      : `About ${(100 * fundamentalFraction).toFixed(0)} % of the resonance power seen is in TEM00, but with fewer than two TEM00 resonances in the sweep no other resonance can be given an order, so misalignment and mismatch cannot be told apart. Sweep over more than one FSR and analyse again.`,
    measure: useHeight ? 'height' : 'area',
    measureReason: useHeight
      ? `Fitted heights (${usedModel} lines at the predicted places, one shared linewidth): the resonances are well sampled (${fmt(samplesPerLinewidth)} samples per linewidth) and smooth.`
      : `Integrated power (area): ${fastStructure ? 'fast structure inside the resonances' : samplesPerLinewidth < 6 ? `only ${fmt(samplesPerLinewidth)} samples per linewidth` : 'the lines do not follow the fitted shape'} makes heights unreliable.`,
    gouy: { predictedOneWayRad: predictedGouy, measuredOneWayRad: calibration && !gouyMirrored ? gouy : null, impliedLengthMm: doubts.impliedLengthMm },
    alternativeReading: doubts.alternative,
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
      readingCost: reading?.cost ?? null,
    },
    samplesPerLinewidth: Number.isFinite(samplesPerLinewidth) ? samplesPerLinewidth : null,
    noise: { sigmaV, darkLevelV },
    channels: { transmission: channels.transmission.name, ramp: channels.ramp?.name ?? null },
    warnings,
  }
}
