import { lengthForGouyPhase, type CavityGeometry } from '../cavity'
import type { EngineWarning } from '../errors'
import type { SpectrumReading } from '../orders/readSpectrum'
import type { AnalysisPeak } from './types'
import { fmt } from '../numbers'
import type { FamilyDisagreement } from './readingChecks'

/**
 * A rival reading that costs less than this much more than the best (in units of the tallest resonance's height:
 * about one unexplained resonance of a tenth of the tallest) is as good an account of the data. Set on the tuning
 * cases of seed 7100 (tests/unit/accuracy/sessionCases.ts), where every wrong reading had a rival within 0.01–0.09
 * and two-thirds of the right ones had none within 0.1; checked on other seed bases by scripts/survey-session.ts.
 */
export const AMBIGUITY_COST = 0.1

/** Unassigned peaks holding this share of the listed resonance height put the reading in doubt. */
const UNASSIGNED_DOUBT = 0.15
/** A reading this costly (units of the tallest resonance's height) … */
const POOR_READING_COST = 0.28
/** … is in doubt when the line model also misfits the samples this badly (χ²ᵥ). */
const POOR_MODEL_CHI_SQUARE = 10

/** The resonances of one order differing in height by more than this factor put the reading in doubt … */
const UNSTEADY_ORDER_RATIO = 2
/** … when the taller stands this many σ above the noise and the two differ by this many σ (5σ, common practice). */
const UNSTEADY_ORDER_SIGMAS = 5

/** … comparing only resonances whose widths agree within this factor (crossed at the same sweep speed). */
const SAME_WIDTH = 1.5

/** The two measures of the TEM00 fraction (line model, resonances found) disagreeing by more than this put it in doubt. */
const MEASURES_DISAGREE = 0.03

/**
 * When the geometry disagrees with the data and fewer than three TEM00 are in view, a rival with another TEM00 family
 * this close (three times AMBIGUITY_COST) puts the reading in doubt.
 */
const RIVAL_WHEN_GEOMETRY_DISAGREES = 0.3

/** The data's Gouy phase must differ from the geometry's by more than this (relative) to call the geometry wrong. */
const GOUY_MISMATCH = 0.015

export interface AlternativeReading {
  /** TEM00 fraction of the rival reading, from its families' heights (rough). */
  fundamentalFraction: number
  direction: 'up' | 'down'
  gouyOneWayRad: number
  fsrSeconds: number
}

export interface ReadingDoubts {
  warnings: EngineWarning[]
  alternative: AlternativeReading | null
  /** Mirror spacing the measured Gouy phase implies with the entered radii, mm (null when it agrees or says nothing). */
  impliedLengthMm: number | null
}

/**
 * What the engine cannot be sure of in its reading of the spectrum, said plainly:
 * - `ambiguous_reading`: another reading (another family as TEM00, the other sweep direction, another period)
 *   explains the resonances about as well and gives a TEM00 fraction more than 3 points away;
 * - `geometry_mismatch`: the Gouy phase measured from the transverse orders differs from the geometry's, and the
 *   length that would give it (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)) is named.
 */
export function readingDoubts(input: {
  readings: SpectrumReading[]
  fundamentalFraction: number
  cavity: CavityGeometry
  predictedGouyRad: number
  measuredGouyRad: number | null
  /** True when ψ came from the weak lines folded over every FSR (see gouyByFolding), not from resonances found. */
  gouyFromWeakLines?: boolean
  /** Transverse resonances whose places measured ψ (resonances of order ≥ 1 labelled). */
  transverseCount: number
  directionGiven: boolean
  /** Height of the peaks left unassigned over the height of all peaks listed. */
  unassignedHeightShare: number
  /** The line model found no TEM00 power where the reading put it (shares then come from the peaks' areas). */
  lineModelFailed: boolean
  /** Reduced χ² of the line model (null when it could not be set up). */
  lineModelChiSquare: number | null
  /** False when the time axis could not be calibrated (one TEM00 and nothing that repeats). */
  calibrated: boolean
  /**
   * The line model's TEM00 fraction (areas at every predicted place) when it misfit the samples and the shares were
   * taken from the resonances found instead; null otherwise.
   */
  lineModelFraction: number | null
  /** TEM00 resonances in view (the reading's). */
  fundamentalCount: number
  /** False when no whole FSR of the sweep could be counted (the orders' powers then come from the peaks seen). */
  wholePeriodCounted: boolean
  /** Orders whose labelled resonances differ in height far beyond the noise (see unsteadyOrder); null when none. */
  unsteady: UnsteadyOrder | null
  /** Transverse families that change height from period to period unlike TEM00 (see familiesDisagree); null when none. */
  familiesDisagree?: FamilyDisagreement | null
  /** A strong low order whose line merges with TEM00's (see lowOrderMergedWithTem00); null when none. */
  mergedLowOrder?: { order: number; linewidths: number } | null
  /** The sweep's span on the calibrated axis (FSR units, TEM00 at whole numbers), or null when uncalibrated. */
  sweepRangeFsr?: [number, number] | null
}): ReadingDoubts {
  const warnings: EngineWarning[] = []
  const [best, ...others] = input.readings
  let alternative: AlternativeReading | null = null
  if (best) {
    // A rival puts TEM00 on other resonances (another family, or another period); the same TEM00 with another Gouy
    // phase changes which weak orders are named, not the TEM00 fraction the line model measures.
    const sameFamily = (r: SpectrumReading) => r.fundamentals.some((i) => best.fundamentals.includes(i)) && Math.abs(r.periodSeconds / best.periodSeconds - 1) <= 0.03
    const rival = others.find((r) => !sameFamily(r) && Math.abs(r.roughFraction - best.roughFraction) > 0.03)
    if (rival && rival.cost - best.cost < AMBIGUITY_COST) {
      alternative = { fundamentalFraction: rival.roughFraction, direction: rival.direction, gouyOneWayRad: rival.gouyRad, fsrSeconds: rival.calibration.fsrSeconds }
      const decide: string[] = []
      if (Math.abs(rival.periodSeconds / best.periodSeconds - 1) > 0.03) decide.push('a sweep over more FSRs, so that every family of resonances repeats')
      if (rival.direction !== best.direction && !input.directionGiven) decide.push('the sweep direction, if you know which way the optical frequency runs during the sweep (analysis option sweepDirection)')
      if (Math.abs(rival.gouyRad / best.gouyRad - 1) > 0.03) decide.push('a check of the cavity length and mirror radii')
      decide.push('a trace after a small alignment change: TEM00 is the family that grows as the alignment improves')
      warnings.push({
        code: 'ambiguous_reading',
        message: `The resonances can be read two ways that explain them about equally well: TEM00 ${fmt(100 * input.fundamentalFraction)} % (reported), or about ${fmt(100 * rival.roughFraction)} % with another family as TEM00 (sweep ${rival.direction}, Gouy phase ${rival.gouyRad.toFixed(3)} rad). The data cannot decide between them; what would: ${decide.join('; ')}.`,
      })
    }
  }
  // No rival, but no good account either: much resonance height at no predicted place, or a reading that leaves
  // much unexplained while the line model misfits the samples (thresholds set on the tuning cases of seed 7100 and
  // checked on seeds 20000 and 30000; figures in README.md). Without any reading (nothing repeats), the tallest
  // comb was taken as TEM00 as a last resort: in doubt too when it leaves resonances unexplained.
  if (!alternative) {
    // Two measures of the same power that disagree by more than the 3 points a result may be off unflagged.
    const measuresDisagree = input.lineModelFraction !== null && Math.abs(input.lineModelFraction - input.fundamentalFraction) > MEASURES_DISAGREE
    const poorModel = input.lineModelChiSquare === null || input.lineModelChiSquare >= POOR_MODEL_CHI_SQUARE
    const unexplained = input.lineModelFailed || input.unassignedHeightShare >= UNASSIGNED_DOUBT || (best !== undefined && best.cost >= POOR_READING_COST && poorModel) || input.unsteady !== null || !!input.familiesDisagree || !!input.mergedLowOrder || !input.calibrated || !input.wholePeriodCounted || measuresDisagree
    if (unexplained) {
      const u = input.unsteady
      // The lead names what is in doubt: the reading itself, or (the reading standing) only the measure of power.
      const measureOnly = measuresDisagree && input.calibrated && input.wholePeriodCounted && input.unassignedHeightShare < UNASSIGNED_DOUBT
      const lead = !input.calibrated || !input.wholePeriodCounted
        ? 'The orders could not be counted'
        : measureOnly || (!!input.mergedLowOrder && !input.familiesDisagree && !u && input.unassignedHeightShare < UNASSIGNED_DOUBT)
          ? 'The resonances are read, but their power cannot be measured reliably'
          : 'No reading of the resonances explains them well'
      const what = !input.calibrated
        ? 'the sweep could not be calibrated (one TEM00 in view and no family of resonances that repeats), so no order could be placed and the fraction is TEM00 against the resonances seen'
        : !input.wholePeriodCounted
        ? 'less than one whole FSR of the sweep could be counted, so the orders were not measured over a full period and the fraction is TEM00 against the resonances seen'
        : measuresDisagree && input.unassignedHeightShare < UNASSIGNED_DOUBT
        ? `the line model misfits the samples, so the shares come from the resonances found (TEM00 ${fmt(100 * input.fundamentalFraction)} %), while the line model's areas at every order's place give ${fmt(100 * input.lineModelFraction!)} %: orders too weak to be found are not counted by the first, misshapen lines are mismeasured by the second`
        : input.lineModelFailed
        ? 'the line model finds no TEM00 power where the reading puts TEM00, so the resonances were counted one by one'
        : u && input.unassignedHeightShare < UNASSIGNED_DOUBT
          ? `the resonances read as ${u.order === 0 ? 'TEM00' : `order ${u.order}`} differ in height ${fmt(u.ratio)}-fold (${u.tallerV.toPrecision(2)} V and ${u.lowerV.toPrecision(2)} V), while one mode resonates once every FSR with one height: the period or the orders may be misread`
          : input.familiesDisagree && input.unassignedHeightShare < UNASSIGNED_DOUBT
            ? familiesText(input.familiesDisagree)
            : input.mergedLowOrder && input.unassignedHeightShare < UNASSIGNED_DOUBT
              ? `order ${input.mergedLowOrder.order} stands ${fmt(input.mergedLowOrder.linewidths)} linewidths from TEM00, so their lines merge and the TEM00 fraction may hold order ${input.mergedLowOrder.order}'s power`
              : `${fmt(100 * input.unassignedHeightShare)} % of the resonance height stands at no order's predicted place`
      warnings.push({
        code: 'ambiguous_reading',
        message: `${lead}: ${what}${input.lineModelChiSquare !== null ? `, and the line model fits the samples with χ²ᵥ = ${fmt(input.lineModelChiSquare)}` : ''}. The TEM00 fraction (${fmt(100 * input.fundamentalFraction)} %) may be wrong by more than its stated error. What would help: a sweep over two or more FSRs, a check of the cavity length and radii, and a look at the trace for fine structure (a ringing detector, a laser on two modes).`,
      })
    }
  }
  let impliedLengthMm: number | null = null
  if (input.measuredGouyRad !== null && (input.transverseCount >= 2 || input.gouyFromWeakLines) && Math.abs(input.measuredGouyRad / input.predictedGouyRad - 1) > GOUY_MISMATCH) {
    impliedLengthMm = lengthForGouyPhase(input.cavity, input.measuredGouyRad)
    const lengthText = impliedLengthMm !== null
      ? `With the entered mirror radii that is a length of ${impliedLengthMm.toFixed(1)} mm (entered: ${Number(input.cavity.lengthMm.toPrecision(6))} mm).`
      : 'No length gives it with the entered mirror radii: check the radii too.'
    warnings.push({
      code: 'geometry_mismatch',
      message: `The transverse orders stand where a one-way Gouy phase of ${input.measuredGouyRad.toFixed(4)} rad puts them; the entered geometry predicts ${input.predictedGouyRad.toFixed(4)} rad (${fmt(100 * (input.measuredGouyRad / input.predictedGouyRad - 1))} %). ${lengthText} The orders are labelled with the measured phase.`,
    })
  }
  // With fewer than three TEM00 the orders' places both calibrate the sweep and measure ψ: when ψ disagrees with the
  // geometry and a reading with another TEM00 family is not far behind, nothing checks that the right family was
  // taken (on the tuning cases of seeds 7100–50000, five of the eight wrong readings left unflagged by the rules above
  // had a geometry that disagreed and one or two TEM00 in view; this rule names three of them and seven right ones).
  if (impliedLengthMm !== null && input.fundamentalCount < 3 && !warnings.some((w) => w.code === 'ambiguous_reading') && (otherFamilyWithin(input.readings, RIVAL_WHEN_GEOMETRY_DISAGREES) || oneLink(input.readings))) {
    warnings.unshift({
      code: 'ambiguous_reading',
      message: `With ${input.fundamentalCount === 1 ? 'one TEM00' : 'two TEM00'} in view, the transverse orders both calibrate the sweep and measure the Gouy phase, and that phase disagrees with the entered geometry: another family of resonances may be TEM00. The TEM00 fraction (${fmt(100 * input.fundamentalFraction)} %) may be wrong by more than its stated error. What would decide: a sweep over three or more FSRs, or a check of the cavity length and mirror radii.`,
    })
  }
  const expected = expectedFundamentals(input.sweepRangeFsr ?? null)
  if (expected > input.fundamentalCount && !warnings.some((w) => w.code === 'ambiguous_reading')) {
    warnings.unshift({
      code: 'ambiguous_reading',
      message: `At the period the reading takes for one FSR, the sweep spans ${fmt(Math.abs(input.sweepRangeFsr![1] - input.sweepRangeFsr![0]))} FSRs and should cross TEM00 ${expected} times, but only ${input.fundamentalCount} TEM00 resonance${input.fundamentalCount === 1 ? ' was' : 's were'} found there: the resonances taken as TEM00 may be a TEM00 and a transverse order, so the period and the TEM00 fraction (${fmt(100 * input.fundamentalFraction)} %) may be wrong by more than the stated error. What would decide: a sweep over more FSRs, and a check of the cavity length and mirror radii.`,
    })
  }
  return { warnings, alternative, impliedLengthMm }
}

/** A TEM00 this close to either end of the sweep (FSR units) may be cut off and is not expected. */
const EDGE_MARGIN_FSR = 0.03

/** TEM00 resonances the calibrated sweep must cross: the whole numbers inside its span, less the margins. */
function expectedFundamentals(range: [number, number] | null): number {
  if (!range || !range.every(Number.isFinite)) return 0
  const lo = Math.min(...range) + EDGE_MARGIN_FSR
  const hi = Math.max(...range) - EDGE_MARGIN_FSR
  return hi < lo ? 0 : Math.max(0, Math.floor(hi) - Math.ceil(lo) + 1)
}

export interface UnsteadyOrder {
  order: number
  ratio: number
  tallerV: number
  lowerV: number
}

/**
 * The order whose labelled resonances differ most in height, when the tallest of them stands UNSTEADY_ORDER_SIGMAS σ
 * clear, the two differ by as much, and by more than UNSTEADY_ORDER_RATIO (drift of the laser power moves heights by
 * some per cent, not twofold). Only meaningful when heights compare: enough samples per linewidth, no fast structure,
 * the same width.
 */
export function unsteadyOrder(peaks: AnalysisPeak[], sigmaV: number): UnsteadyOrder | null {
  const byOrder = new Map<number, AnalysisPeak[]>()
  for (const p of peaks) {
    if (p.kind !== 'carrier' || p.order === null) continue
    const members = byOrder.get(p.order)
    if (members) members.push(p)
    else byOrder.set(p.order, [p])
  }
  let worst: UnsteadyOrder | null = null
  for (const [order, members] of byOrder) {
    const taller = members.reduce((a, b) => (b.height > a.height ? b : a))
    // Only resonances crossed at the same speed compare: one cut by the end of the record, or crossed during a
    // flyback or past a turn of the sweep, has another width and another height.
    const alike = members.filter((p) => p !== taller && p.fwhmSeconds >= taller.fwhmSeconds / SAME_WIDTH && p.fwhmSeconds <= taller.fwhmSeconds * SAME_WIDTH)
    if (alike.length === 0) continue
    const tallerV = taller.height
    const lowerV = Math.max(Math.min(...alike.map((p) => p.height)), 0)
    const ratio = lowerV > 0 ? tallerV / lowerV : Infinity
    if (tallerV < UNSTEADY_ORDER_SIGMAS * sigmaV || tallerV - lowerV < UNSTEADY_ORDER_SIGMAS * sigmaV || !(ratio > UNSTEADY_ORDER_RATIO)) continue
    if (!worst || ratio > worst.ratio) worst = { order, ratio, tallerV, lowerV }
  }
  return worst
}

/**
 * The best reading's period rests on one pair of resonances (one family repeating once): with the geometry also
 * disagreeing, nothing independent confirms which family is TEM00 (seeds 40000–60000: two wrong readings left
 * unflagged; five right ones of 600 flagged as well).
 */
function oneLink(readings: SpectrumReading[]): boolean {
  return readings.length > 0 && readings[0].calibratingLinks <= 1
}

function familiesText(f: FamilyDisagreement): string {
  const orders = f.orders.map((o) => `order ${o.order} ×${o.ratio.toFixed(2)}`).join(', ')
  return `from one FSR period to the next TEM00 changes height ×${f.fundamentalRatio.toFixed(2)} but ${orders}, while every line of a real reading scales alike with the laser power: the resonances taken as one family are likely not one mode, so the period or the TEM00 family may be misread`
}

/** A rival reading with another TEM00 family within this cost of the best one (see RIVAL_WHEN_GEOMETRY_DISAGREES). */
function otherFamilyWithin(readings: SpectrumReading[], cost: number): boolean {
  const [best, ...others] = readings
  if (!best) return false
  return others.some((r) => !r.fundamentals.some((i) => best.fundamentals.includes(i)) && r.cost - best.cost < cost)
}

/** Height of the unassigned peaks over the height of all peaks listed (0 with none). */
export function unassignedShareOf(peaks: AnalysisPeak[]): number {
  let all = 0
  let unassigned = 0
  for (const p of peaks) {
    all += Math.max(0, p.height)
    if (p.kind === 'unassigned') unassigned += Math.max(0, p.height)
  }
  return all > 0 ? unassigned / all : 0
}
