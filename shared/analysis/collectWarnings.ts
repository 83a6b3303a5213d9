import type { EngineWarning } from '../errors'
import type { MeasuredResonance } from '../peaks/measureResonances'
import type { OrderLabel } from '../orders/assignOrders'
import { predictOrderOffsets } from '../orders/predictOrderOffsets'

export interface WarningInputs {
  part: Float64Array
  signal: Float64Array
  sigmaV: number
  quantumV: number
  measured: MeasuredResonance[]
  labels: OrderLabel[]
  fundamentals: number[]
  samplesPerLinewidth: number
  gouyRad: number
  linewidthFsr: number
  /** Three samples on the calibrated axis, FSR: lines closer than the sampling resolves cannot be told apart either. */
  resolutionFsr: number
  orders: Record<string, number>
  /** True when the time axis is calibrated (on TEM00, or on the transverse families when one TEM00 is in view). */
  calibrated: boolean
  /** RMS distance of the matched carriers from their predicted places, FSR units (null without a calibration). */
  orderResidualRmsFsr: number | null
  /**
   * Sweep speed s = r / (π δν²): the optical sweep rate r (Hz/s) against the square of the linewidth δν (Hz), from
   * the narrower of the measured and the design linewidth; null without a calibration. See SWEEP_SPEED_RINGING.
   */
  sweepSpeed: number | null
  /** The finesse measured from the ring-down and the one the widened lines would give, when the sweep rings. */
  ringdownFinesse: { value: number; apparent: number } | null
  /** True when the tall resonances came as trains of spikes, merged into one resonance each (a fast dither). */
  spikeTrains: boolean
}

/**
 * Sweep speed above which a resonance rings and broadens. With τ = 1/(π δν) the field's decay time, s = π r τ² is
 * the frequency swept in one decay time over the linewidth / π; a steady-state Lorentzian needs s ≪ 1, and
 * ring-down beats appear from s ≈ 0.1–1 (Poirson et al., J. Opt. Soc. Am. B 14, 2811 (1997)). Ringing broadens
 * the apparent linewidth δν' roughly as √(r/π) once strong, so the s read from δν' saturates near 0.4–0.5:
 * the threshold sits below that (from this project's generator, which integrates the intracavity field).
 */
export const SWEEP_SPEED_RINGING = 0.15

/** Highest order checked for degeneracy warnings (higher ones rarely carry power worth a warning). */
const DEGENERACY_MAX_ORDER = 6
/**
 * Two lines closer than this many linewidths (FWHM) overlap too much to share their power out reliably: at 3 FWHM a
 * Lorentzian still has 3 % of its height at its neighbour's centre, at 1 FWHM 20 % (Born & Wolf, "Principles of
 * Optics", §7.6, for the line shape; the threshold is common practice).
 */
const DEGENERATE_LINEWIDTHS = 3
/** A merged pair of orders matters when it carries at least this share of the power (common practice). */
const DEGENERATE_MIN_SHARE = 0.005
/**
 * An unassigned resonance within this many linewidths of an assigned one is taken as its fragment or fine structure
 * (a resonance found twice, an astigmatic split, a ringing lobe, a sideband) rather than an order the geometry misses
 * (common practice: such structure sits within a few linewidths of its line).
 */
const FRAGMENT_LINEWIDTHS = 5

/** The findings that qualify the result, each with a stable code (see the result's `warnings`). */
export function collectWarnings(input: WarningInputs): EngineWarning[] {
  const w: EngineWarning[] = []
  const { measured, fundamentals } = input
  if (!(input.samplesPerLinewidth >= 6)) {
    w.push({
      code: 'undersampled',
      message: `Only ${input.samplesPerLinewidth.toFixed(1)} samples per TEM00 linewidth (6 or more wanted for a trustworthy fit): shares use integrated power; linewidth and finesse are rough. Record with a shorter sample interval or a slower sweep.`,
    })
  }
  const saturated = saturation(input.part, measured, input.quantumV, input.sigmaV)
  if (saturated) w.push({ code: 'saturated', message: saturated })
  const fundamentalCount = distinctFundamentals(input)
  if (fundamentalCount < 2) {
    w.push({
      code: 'single_fundamental',
      message: input.calibrated
        ? 'One TEM00 resonance in the sweep: the time axis is calibrated on the transverse families that repeat one FSR later, and the orders are placed from it. The FSR on the time axis is the local period at that TEM00, only as good as the few resonances pin the bend of the sweep (a percent or two on a nonlinear piezo). Sweep over two FSRs or more for a firmer reading.'
        : 'Fewer than two TEM00 resonances in the sweep and no family of resonances that repeats: the time axis cannot be calibrated, transverse orders cannot be placed and the FSR comes from the cavity length only. The TEM00 fraction is only TEM00 power against all resonance power seen, a rough figure. Sweep over more than one FSR.',
    })
  }
  if (fundamentalCount === 2) {
    const spread = input.orderResidualRmsFsr !== null && input.orderResidualRmsFsr > 0 ? ` by about ±${Math.max(input.orderResidualRmsFsr, 1e-4).toFixed(4)} FSR` : ''
    w.push({
      code: 'two_fundamentals',
      message: `Only two TEM00 resonances: the piezo nonlinearity cannot be read from the TEM00 spacing alone, so the sweep between them is taken from the transverse families that repeat and from the places of the transverse modes; order positions are uncertain${spread}, and so is the measured Gouy phase. Sweep over three or more FSRs for a checked calibration.`,
    })
  }
  const degenerate = degeneracy(input)
  if (degenerate) w.push({ code: 'degenerate_orders', message: degenerate })
  const lobed = fundamentals.filter((k) => measured[k].lobeCount >= 3)
  const fast = input.sweepSpeed !== null && input.sweepSpeed >= SWEEP_SPEED_RINGING
  if (fast) {
    // With the ring-down finesse the speed follows from the true linewidth: s ∝ 1/δν² ∝ 𝓕².
    const speed = input.ringdownFinesse ? input.sweepSpeed! * (input.ringdownFinesse.value / input.ringdownFinesse.apparent) ** 2 : input.sweepSpeed!
    w.push({
      code: 'ringing',
      message: input.ringdownFinesse
        ? `The sweep is too fast for the linewidth: it crosses a linewidth in about ${(1 / speed).toFixed(1)} field decay times (sweep speed ${speed.toFixed(2)}; below about 0.1 the cavity follows the sweep). The light rings after each resonance and the resonances look wider, so the finesse (${input.ringdownFinesse.value.toFixed(0)}) comes from fitting the ring-down of the TEM00 resonances; their widths alone would say ${input.ringdownFinesse.apparent.toFixed(0)}. The order shares stay sound, since every order rings alike.`
        : `The sweep is too fast for the linewidth: it crosses a linewidth in about ${(1 / speed).toFixed(1)} field decay times (sweep speed ${speed.toFixed(2)}; below about 0.1 the cavity follows the sweep). The light rings after each resonance and the resonances look wider: the measured linewidth is too wide and the finesse too low (a lower bound). The order shares stay sound, since every order rings alike. Sweep more slowly to measure the linewidth.`,
    })
  }
  if (input.spikeTrains && !fast) {
    w.push({
      code: 'fast_structure',
      message: 'Each resonance comes as a train of spikes (a laser-frequency dither of about a linewidth or more, faster than the sweep): the spikes of each train are taken as one resonance and measured by their integrated power. The fraction is rough (a few points) and the linewidth too wide; switch the dither off or make it smaller than the linewidth.',
    })
  } else if (lobed.length > 0 && !fast) {
    const trailing = lobed.filter((k) => leadingLobeIsTallest(input.signal, measured[k]))
    if (trailing.length * 2 >= lobed.length) {
      w.push({
        code: 'ringing',
        message: `${lobed.length} TEM00 resonance(s) show a decaying oscillation after the peak: the sweep crosses the linewidth faster than the cavity storage time. Shares use integrated power; the fitted linewidth is too wide. Sweep more slowly.`,
      })
    } else {
      w.push({
        code: 'fast_structure',
        message: `${lobed.length} TEM00 resonance(s) carry fast structure (several maxima inside one resonance, e.g. a laser-frequency dither): each is measured as one resonance by its integrated power.`,
      })
    }
  }
  const trailing = trailingTail(input)
  // A clipped top has no single maximum to measure the tail from.
  if (trailing !== null && trailing.shift >= Math.max(TRAILING_TAIL, 4 * trailing.error) && !fast && !saturated) {
    w.push({
      code: 'slow_detector',
      message: `The TEM00 resonances trail a tail after their peak (their centre of mass lies ${trailing.shift.toFixed(2)} linewidths after the maximum; a Lorentzian has none): the detector or its amplifier is too slow for the sweep. The linewidth reads wide and the finesse low; the order shares stay sound, since every order is smeared alike. Use a faster detector, less gain, or a slower sweep to measure the linewidth.`,
    })
  }
  const heights = fundamentals.map((k) => measured[k].heightV).filter((h) => h > 10 * input.sigmaV)
  if (heights.length >= 2) {
    const ratio = Math.max(...heights) / Math.min(...heights)
    if (ratio > 1.3) {
      w.push({
        code: 'unsteady_fundamental',
        message: `TEM00 heights vary ${ratio.toFixed(1)}-fold across the sweep (an unsteady laser or coupling): the TEM00 fraction is an average over the sweep.`,
      })
    }
  }
  const unassigned = unassignedWarning(input)
  if (unassigned) w.push({ code: 'many_unassigned', message: unassigned })
  return w
}

/**
 * TEM00 resonances in the record: those the calibration used, and those the assignment labelled order 0 that stand
 * at least half as tall as the calibration's (one laser feeds every TEM00 of a sweep alike; a short line labelled 0 at
 * the edge of the sweep is more likely a transverse order read one place off), where two within FRAGMENT_LINEWIDTHS of
 * each other are one resonance found twice. Counting the calibration's list alone misses a TEM00 it left out and
 * counts a split one twice.
 */
function distinctFundamentals(input: WarningInputs): number {
  const { measured, labels, fundamentals } = input
  const members = new Set(fundamentals.filter((k) => k >= 0 && k < measured.length))
  const heights = [...members].map((k) => measured[k].heightV).sort((a, b) => a - b)
  const typical = heights.length ? heights[heights.length >> 1] : 0
  labels.forEach((l, i) => {
    if (l.kind === 'carrier' && l.order === 0 && measured[i].heightV >= 0.5 * typical) members.add(i)
  })
  const centres = [...members].map((k) => measured[k].centerIndex).sort((a, b) => a - b)
  const reach = FRAGMENT_LINEWIDTHS * linewidthSamples(input)
  let count = 0
  let last = -Infinity
  for (const c of centres) {
    if (c - last > reach) count++
    last = c
  }
  return count
}

/** The TEM00 linewidth in samples (the median of the resonances' widths when it is unknown). */
function linewidthSamples(input: WarningInputs): number {
  if (input.samplesPerLinewidth > 0 && Number.isFinite(input.samplesPerLinewidth)) return input.samplesPerLinewidth
  const widths = input.measured.map((m) => m.fwhmSamples).filter((x) => x > 0).sort((a, b) => a - b)
  return widths.length ? widths[widths.length >> 1] : 1
}

/**
 * Many resonances that match no order: say what they likely are from where they sit. Beside an assigned resonance
 * (within FRAGMENT_LINEWIDTHS) they are pieces of it — a resonance found twice, split lines (astigmatism), ringing or
 * a dither — and the geometry is not to blame; far from every assigned one they are resonances the predicted places
 * miss: a wrong length or radius, a second laser mode or a modulation frequency.
 */
function unassignedWarning(input: WarningInputs): string | null {
  const { measured, labels } = input
  const unassigned = labels.flatMap((l, i) => (l.kind === 'unassigned' ? [i] : []))
  if (!(unassigned.length >= 3 && unassigned.length > 0.2 * labels.length)) return null
  const assigned = labels.flatMap((l, i) => (l.kind !== 'unassigned' ? [i] : []))
  const fallback = linewidthSamples(input)
  let beside = 0
  for (const u of unassigned) {
    const near = assigned.some((a) => {
      // The assigned line's own width holds the local sweep rate; the TEM00 width stands in when it has none.
      const width = measured[a].fwhmSamples > 0 ? Math.max(measured[a].fwhmSamples, fallback) : fallback
      return Math.abs(measured[u].centerIndex - measured[a].centerIndex) <= FRAGMENT_LINEWIDTHS * width
    })
    if (near) beside++
  }
  const far = unassigned.length - beside
  const head = `${unassigned.length} of ${labels.length} resonances match no predicted order`
  if (far === 0 || beside >= 2 * far) {
    return `${head}; ${beside === unassigned.length ? 'all' : `${beside}`} sit within ${FRAGMENT_LINEWIDTHS} linewidths of an assigned resonance: they are likely fragments or fine structure of it (a resonance found twice, lines split by astigmatism, ringing or a laser dither), not orders the geometry misses. The shares count the assigned resonances; look at those resonances' shapes rather than at the cavity length and radii.`
  }
  if (beside === 0 || far >= 2 * beside) {
    return `${head} and ${far === unassigned.length ? 'none' : `only ${beside}`} sit${beside === 1 ? 's' : ''} beside an assigned resonance: they stand where no order is predicted. Check the cavity length and mirror radii (or a second laser mode, or the modulation frequency).`
  }
  return `${head}: ${beside} sit within ${FRAGMENT_LINEWIDTHS} linewidths of an assigned resonance (likely fragments or fine structure of it), ${far} stand where no order is predicted (check the cavity length and mirror radii, or a second laser mode / modulation frequency).`
}

/**
 * Time always runs one way through a detector: a low-pass (a single pole of time constant τ) delays the light it
 * passes, leaving a tail after each peak, whichever way the sweep runs. The centre of mass then lies after the
 * maximum, about τ for a slow detector; for a Lorentzian (Born & Wolf, "Principles of Optics", §7.6) it lies on
 * the maximum. Median over the TEM00 resonances of (centre of mass − maximum) / FWHM within ±3 FWHM, with the
 * noise of that median, or null when no TEM00 stands 20σ tall with 6 or more samples per FWHM.
 */
function trailingTail(input: WarningInputs): { shift: number; error: number } | null {
  const { signal, measured, fundamentals, sigmaV } = input
  const shifts: number[] = []
  const errors: number[] = []
  for (const k of fundamentals) {
    const m = measured[k]
    const w = m.fwhmSamples
    if (!(w >= 6) || !(m.heightV >= 20 * sigmaV)) continue
    const from = Math.max(0, Math.floor(m.centerIndex - 3 * w))
    const to = Math.min(signal.length - 1, Math.ceil(m.centerIndex + 3 * w))
    let top = from
    for (let i = from; i <= to; i++) if (signal[i] > signal[top]) top = i
    let sum = 0
    let moment = 0
    for (let i = Math.max(0, Math.floor(top - 3 * w)); i <= Math.min(signal.length - 1, Math.ceil(top + 3 * w)); i++) {
      sum += signal[i]
      moment += signal[i] * (i - top)
    }
    if (!(sum > 0)) continue
    shifts.push(moment / sum / w)
    // White noise σ in the moment: σ·√(Σ (i − top)²) ≈ σ·√(18 w³) over ±3w, over the sum and w.
    errors.push((sigmaV * Math.sqrt(18 * w * w * w)) / sum / w)
  }
  if (shifts.length === 0) return null
  shifts.sort((a, b) => a - b)
  errors.sort((a, b) => a - b)
  return { shift: shifts[shifts.length >> 1], error: errors[errors.length >> 1] / Math.sqrt(shifts.length) }
}

/**
 * Centre of mass this many FWHM after the maximum, and four times its noise: a detector time constant of 0.3
 * linewidth gives 0.09, of 1 linewidth 0.24 (this project's generator), where the finesse reads 17 % and 48 % low.
 */
const TRAILING_TAIL = 0.06

/**
 * A saturated detector or digitiser cuts the tall resonances flat: their samples hold the highest value over the
 * stretch where the line would have stood above the clip. An unclipped line is rounded at its top: near the maximum
 * a Lorentzian or Airy line falls as H·(1 − x²) (x in half-widths; Born & Wolf, "Principles of Optics", §7.6), so the
 * samples within δ of its top span only 2·HWHM·√(δ/H). The samples counted at the top are those on the top code
 * (quantised) or within 4σ of it; δ is one code plus the noise beyond quantisation. A resonance is called clipped when
 * it holds the top for 3 samples or more and more than twice that span (a factor of two for safety, common practice).
 * So a single top sample, or resonances of equal height that reach the same code because the full scale sits just
 * above them, are not saturation; resonances narrower than about 3 samples cannot show it.
 */
function saturation(part: Float64Array, measured: MeasuredResonance[], quantumV: number, sigmaV: number): string | null {
  let top = -Infinity
  for (let i = 0; i < part.length; i++) if (part[i] > top) top = part[i]
  if (!(top > -Infinity)) return null
  // Noise beyond the quantisation noise q/√12 (Bennett, Bell Syst. Tech. J. 27, 446 (1948)).
  const extraNoiseV = Math.sqrt(Math.max(0, sigmaV * sigmaV - (quantumV * quantumV) / 12))
  const band = quantumV > 0 ? quantumV / 2 + 4 * extraNoiseV : 4 * sigmaV
  const depthV = quantumV + 8 * extraNoiseV + (quantumV > 0 ? 0 : 4 * sigmaV)
  const heightV = top - baselineOf(part)
  if (!(heightV > 2 * band)) return null
  let clipped = 0
  let longest = 0
  let expectedAtLongest = 0
  for (const m of measured) {
    const c = Math.round(m.centerIndex)
    const reach = Math.max(3, Math.ceil(2 * m.fwhmSamples))
    let run = 0
    let longestHere = 0
    for (let i = Math.max(0, c - reach); i <= Math.min(part.length - 1, c + reach); i++) {
      run = part[i] >= top - band ? run + 1 : 0
      if (run > longestHere) longestHere = run
    }
    if (longestHere < 3) continue
    const expected = m.fwhmSamples * Math.sqrt(depthV / heightV) + 1
    if (longestHere <= 2 * expected) continue
    clipped++
    if (longestHere > longest) {
      longest = longestHere
      expectedAtLongest = expected
    }
  }
  if (clipped === 0) return null
  return `${clipped} resonance(s) are cut flat at the top value (${top.toPrecision(4)} V): up to ${longest} samples in a row hold it, where an unclipped line of that width would stay within one step of its top for about ${Math.max(1, Math.round(expectedAtLongest))}. The detector or digitiser is likely saturated, so the tallest resonances read low and the TEM00 fraction low. Reduce the gain or the vertical scale.`
}

/**
 * Orders that share a place on the FSR circle: order N sits N·ψ/π (mod 1) FSR above TEM00 (Siegman, "Lasers" (1986),
 * ch. 19). A pair matters when its lines stand within DEGENERATE_LINEWIDTHS linewidths at the measured finesse and it
 * carries power or could: TEM00 always (it could hide the other order's power), else when the pair's reported shares
 * reach DEGENERATE_MIN_SHARE.
 */
function degeneracy(input: WarningInputs): string | null {
  const offsets = predictOrderOffsets(input.gouyRad, DEGENERACY_MAX_ORDER)
  // An undersampled record resolves no better than a few samples, whatever the finesse.
  const resolved = input.resolutionFsr > input.linewidthFsr
  const linewidthFsr = Math.max(input.linewidthFsr, input.resolutionFsr)
  if (!(linewidthFsr > 0)) return null
  const share = (order: number) => input.orders[String(order)] ?? 0
  const pairs: { a: number; b: number; apartFsr: number }[] = []
  for (let a = 0; a <= DEGENERACY_MAX_ORDER; a++) {
    for (let b = a + 1; b <= DEGENERACY_MAX_ORDER; b++) {
      const d = Math.abs(offsets[a] - offsets[b])
      const apartFsr = Math.min(d, 1 - d)
      if (apartFsr > DEGENERATE_LINEWIDTHS * linewidthFsr) continue
      if (a !== 0 && share(a) + share(b) < DEGENERATE_MIN_SHARE) continue
      pairs.push({ a, b, apartFsr })
    }
  }
  if (pairs.length === 0) return null
  // Closest first; pairs equally far apart (to 1e-6 FSR) in order of their lower member.
  pairs.sort((x, y) => Math.round(1e6 * (x.apartFsr - y.apartFsr)) || x.a - y.a || x.b - y.b)
  const shown = pairs.slice(0, 4).map((p) => `${p.a} and ${p.b} (${(p.apartFsr / linewidthFsr).toFixed(1)} ${resolved ? 'steps' : 'linewidths'}, ${p.apartFsr.toPrecision(2)} FSR)`)
  const more = pairs.length > shown.length ? ` and ${pairs.length - shown.length} more pair(s)` : ''
  const finesse = 1 / linewidthFsr
  return `Transverse orders ${shown.join(', ')}${more} stand within ${DEGENERATE_LINEWIDTHS} ${resolved ? 'resolution steps (three samples each: the record is sampled more coarsely than the linewidth)' : 'linewidths'} of each other at the measured finesse (${finesse.toFixed(0)}; order N sits N·ψ/π FSR above TEM00 with ψ/π = ${(input.gouyRad / Math.PI).toFixed(4)}): their lines overlap and their powers cannot be told apart, so the share given to the lower order of each pair may hold the other's power too${pairs.some((p) => p.a === 0) ? ', and the TEM00 fraction may include a transverse order' : ''}. A cavity length a little farther from this degeneracy separates them.`
}

function leadingLobeIsTallest(signal: Float64Array, m: MeasuredResonance): boolean {
  // Ringing follows the crossing: the first maximum is the tallest and later ones decay.
  const c = Math.round(m.centerIndex)
  let firstAbove = c
  const half = m.maxV / 2
  while (firstAbove > 0 && signal[firstAbove - 1] > half * 0.2) firstAbove--
  let tallest = firstAbove
  for (let i = firstAbove; i < Math.min(signal.length, c + 4 * m.fwhmSamples); i++) if (signal[i] > signal[tallest]) tallest = i
  return tallest - firstAbove < 0.5 * (c - firstAbove + m.fwhmSamples)
}

function baselineOf(part: Float64Array): number {
  const sample: number[] = []
  const step = Math.max(1, Math.floor(part.length / 2000))
  for (let i = 0; i < part.length; i += step) if (Number.isFinite(part[i])) sample.push(part[i])
  sample.sort((a, b) => a - b)
  return sample[Math.floor(sample.length / 2)] ?? 0
}
