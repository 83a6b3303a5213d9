import { expect } from 'vitest'

/**
 * Asserts that `actual` agrees with a check value to every digit printed in `printed` (half a unit in the last
 * printed place). The check values are quoted as printed in the reference table, so the test holds exactly as many
 * digits as the source gives. Values printed with fewer than 6 significant digits (0, 0.5, 0.25, 0.6 …) are exact
 * in the source and are held to 1e-9 relative (1e-12 absolute at zero).
 */
export function expectPrintedDigits(actual: number, printed: string): void {
  const expected = Number(printed)
  if (significantDigits(printed) < 6) {
    const exactTolerance = expected === 0 ? 1e-12 : 1e-9 * Math.abs(expected)
    expect(Math.abs(actual - expected), `${actual} vs exact ${printed}`).toBeLessThanOrEqual(exactTolerance)
    return
  }
  const [mantissa, exponentText] = printed.toLowerCase().split('e')
  const decimals = mantissa.includes('.') ? mantissa.split('.')[1].length : 0
  const tolerance = 0.5 * 10 ** (-decimals + Number(exponentText ?? 0)) * (1 + 1e-9)
  expect(Math.abs(actual - expected), `${actual} vs ${printed}`).toBeLessThanOrEqual(tolerance)
}

/** Significant digits printed in a check value (leading zeros excluded). */
export function significantDigits(printed: string): number {
  const mantissa = printed.toLowerCase().split('e')[0].replace('-', '').replace('.', '').replace(/^0+/, '')
  return mantissa.length
}
