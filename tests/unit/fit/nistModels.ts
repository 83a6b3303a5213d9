/**
 * The NIST StRD nonlinear-regression models, written out by hand from each dataset's `model` text
 * (fixtures/nist-strd/<Name>.json), and a loader for the copied JSON files.
 */
import { readFileSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'

export interface NistDataset {
  name: string
  x: number[]
  y: number[]
  start1: number[]
  start2: number[]
  certified: { params: number[]; stdErrors: number[]; residualSumOfSquares: number }
}

const fixtureDir = join(dirname(fileURLToPath(import.meta.url)), '../../../fixtures/nist-strd')

export function loadNistDataset(name: string): NistDataset {
  // The files' verification notes use Python's JSON dialect (-Infinity / NaN for a failed re-fit); make it strict JSON.
  const text = readFileSync(join(fixtureDir, `${name}.json`), 'utf8').replace(/-?\bInfinity\b|\bNaN\b/g, 'null')
  return JSON.parse(text) as NistDataset
}

type Model = (b: number[]) => (x: number) => number

const threeExponentials: Model = (b) => (x) => b[0] * Math.exp(-b[1] * x) + b[2] * Math.exp(-b[3] * x) + b[4] * Math.exp(-b[5] * x)
const exponentialPlusTwoGaussians: Model = (b) => (x) =>
  b[0] * Math.exp(-b[1] * x) +
  b[2] * Math.exp(-((x - b[3]) ** 2) / b[4] ** 2) +
  b[5] * Math.exp(-((x - b[6]) ** 2) / b[7] ** 2)
const saturatingExponential: Model = (b) => (x) => b[0] * (1 - Math.exp(-b[1] * x))

/** Model functions y = f(x; b1..bp), parameters zero-indexed (b[0] is NIST's b1). */
export const nistModels: Record<string, Model> = {
  Eckerle4: (b) => (x) => (b[0] / b[1]) * Math.exp(-0.5 * ((x - b[2]) / b[1]) ** 2),
  Gauss1: exponentialPlusTwoGaussians,
  Gauss2: exponentialPlusTwoGaussians,
  Gauss3: exponentialPlusTwoGaussians,
  MGH09: (b) => (x) => (b[0] * (x * x + x * b[1])) / (x * x + x * b[2] + b[3]),
  Thurber: (b) => (x) =>
    (b[0] + b[1] * x + b[2] * x ** 2 + b[3] * x ** 3) / (1 + b[4] * x + b[5] * x ** 2 + b[6] * x ** 3),
  Misra1a: saturatingExponential,
  BoxBOD: saturatingExponential,
  Lanczos1: threeExponentials,
  Lanczos2: threeExponentials,
  Lanczos3: threeExponentials,
  Rat43: (b) => (x) => b[0] / (1 + Math.exp(b[1] - b[2] * x)) ** (1 / b[3]),
  MGH10: (b) => (x) => b[0] * Math.exp(b[1] / (x + b[2])),
}

/** Log relative error: ≈ number of agreeing significant digits (NIST StRD's LRE), capped at 16. */
export function logRelativeError(estimate: number, certified: number): number {
  const rel = Math.abs(estimate - certified) / Math.abs(certified)
  return rel === 0 ? 16 : Math.min(16, -Math.log10(rel))
}
