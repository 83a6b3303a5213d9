/**
 * Plain-words reading of the order shares. Order-1 power comes from misalignment (offset or tilt), order-2
 * power from waist-size or waist-position mismatch (Anderson, Appl. Opt. 23, 2944 (1984)); in each pair the two
 * causes enter in quadrature, so transmitted power alone cannot tell them apart.
 */
export function readingOfShares(fundamentalFraction: number, misalignmentShare: number, mismatchShare: number): string {
  const pct = (x: number) => `${(100 * x).toFixed(1)} %`
  const parts = [`${pct(fundamentalFraction)} of the carrier power is in TEM00.`]
  const other = Math.max(0, 1 - fundamentalFraction - misalignmentShare - mismatchShare)
  if (misalignmentShare < 0.005 && mismatchShare < 0.005) {
    parts.push('Order-1 and order-2 power are both below 0.5 %: alignment and mode size are fine.')
  } else if (misalignmentShare >= mismatchShare) {
    parts.push(
      `Order 1 carries ${pct(misalignmentShare)} (misalignment) and order 2 ${pct(mismatchShare)} (mode mismatch): adjust the steering mirrors first.`,
    )
  } else {
    parts.push(
      `Order 2 carries ${pct(mismatchShare)} (mode mismatch) and order 1 ${pct(misalignmentShare)} (misalignment): adjust the mode-matching lens positions first.`,
    )
  }
  if (other >= 0.01) parts.push(`Higher orders carry ${pct(other)}: a large misalignment or mismatch, or a poor beam.`)
  parts.push(
    'Power alone cannot tell a beam offset from a tilt, nor a wrong waist size from a wrong waist position: walk the beam with two mirrors, and move one lens, watching the shares.',
  )
  return parts.join(' ')
}
