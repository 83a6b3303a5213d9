/** Generated exports for API and browser tests: a synthetic swept trace written as CSV. */
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { CavityGeometry } from '../../shared/cavity'
import { formatSweptTraceCsv } from '../../shared/sim/formatSweptTraceCsv'
import { generateSweptTrace } from '../../shared/sim/generateSweptTrace'
import type { SweptTraceOptions } from '../../shared/sim/types'

/** The cavity the generated traces belong to (plano-concave, 1064 nm). */
export const testCavityGeometry: CavityGeometry = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: 500 }

/** A small, well-behaved swept trace of the test cavity (invented data). */
function smallSweptTrace(overrides: Partial<SweptTraceOptions>) {
  return generateSweptTrace({
    cavity: testCavityGeometry,
    gouyOneWayRad: 0,
    finesse: 400,
    orderPowers: [0.8, 0.1, 0.07, 0.03],
    sampleCount: 20_000,
    fsrCount: 2.2,
    sampleIntervalSeconds: 1e-5,
    noiseFraction: 0.003,
    seed: 7,
    ...overrides,
  })
}

/** A small, well-behaved swept trace as CSV text (time, ramp, transmission). */
export function generatedTraceCsv(overrides: Partial<SweptTraceOptions> = {}): string {
  return formatSweptTraceCsv(smallSweptTrace(overrides), { layout: 'plain-columns', significantDigits: 7 })
}

/** The same kind of trace as a one-column export: transmission values only, no time column, no interval stated. */
export function oneColumnTraceCsv(overrides: Partial<SweptTraceOptions> = {}): string {
  return formatSweptTraceCsv(smallSweptTrace({ includeRamp: false, ...overrides }), { layout: 'single-column', significantDigits: 7 })
}

/** Write text to a file in a fresh temporary folder; returns its path. */
export function writeTempFile(name: string, content: string | Buffer): string {
  const path = join(mkdtempSync(join(tmpdir(), 'cavitrace-test-')), name)
  writeFileSync(path, content)
  return path
}
