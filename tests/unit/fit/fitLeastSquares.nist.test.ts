import { describe, expect, it } from 'vitest'
import { fitLeastSquares } from '../../../shared/fit'
import { loadNistDataset, logRelativeError, nistModels } from './nistModels'

// NIST StRD nonlinear regression (public domain): certified parameters, standard deviations and RSS from the
// dataset files copied into fixtures/nist-strd/. The brief asks for 5 significant digits from both starting points;
// we assert 6 (LRE ≥ 6), except Lanczos3 whose data carry only 5 digits: there the reference fits with MINPACK
// reached LRE 6.4–6.8 (OPTICS-CHECKS.md §1 suggests a relative tolerance of 1e-5), so we assert 5.
const required = ['Eckerle4', 'Gauss1', 'Gauss2', 'Gauss3', 'MGH09', 'Thurber', 'Misra1a', 'Lanczos3'] as const

describe('fitLeastSquares on NIST StRD certified datasets', () => {
  for (const name of required) {
    for (const start of ['start1', 'start2'] as const) {
      it(`when fitting ${name} from ${start} then it reproduces the NIST StRD certified values`, () => {
        const data = loadNistDataset(name)
        const result = fitLeastSquares(data.x, data.y, nistModels[name], { initialValues: data[start] })
        expect(result.converged).toBe(true)
        const digits = name === 'Lanczos3' ? 5 : 6
        result.parameters.forEach((value, j) => {
          // NIST StRD certified parameter
          expect(logRelativeError(value, data.certified.params[j])).toBeGreaterThanOrEqual(digits)
        })
        result.standardErrors.forEach((value, j) => {
          // NIST StRD certified standard deviation, ≥ 4 significant digits (the brief asks for ~2–3)
          expect(logRelativeError(value, data.certified.stdErrors[j])).toBeGreaterThanOrEqual(4)
        })
        // NIST StRD certified residual sum of squares
        expect(logRelativeError(result.residualSumOfSquares, data.certified.residualSumOfSquares)).toBeGreaterThanOrEqual(8)
      })
    }
  }

  it('when fitting Rat43 then the standard errors use n − p = 11 degrees of freedom, as NIST StRD certified values do', () => {
    const data = loadNistDataset('Rat43')
    const result = fitLeastSquares(data.x, data.y, nistModels.Rat43, { initialValues: data.start2 })
    result.standardErrors.forEach((value, j) => {
      expect(logRelativeError(value, data.certified.stdErrors[j])).toBeGreaterThanOrEqual(4)
    })
  })

  it('when fitting BoxBOD from start 1 then it either reaches the NIST StRD certified answer or says it did not converge', () => {
    const data = loadNistDataset('BoxBOD')
    const result = fitLeastSquares(data.x, data.y, nistModels.BoxBOD, { initialValues: data.start1 })
    const reachedCertified = result.parameters.every((v, j) => logRelativeError(v, data.certified.params[j]) >= 5)
    // A wrong answer flagged as converged is the one outcome that is a failure.
    expect(reachedCertified || !result.converged).toBe(true)
    if (!result.converged) expect(result.message).toMatch(/not determine|rank-deficient|stuck|maximum/)
  })

  it('when fitting BoxBOD from start 2 then it reproduces the NIST StRD certified parameters', () => {
    const data = loadNistDataset('BoxBOD')
    const result = fitLeastSquares(data.x, data.y, nistModels.BoxBOD, { initialValues: data.start2 })
    expect(result.converged).toBe(true)
    result.parameters.forEach((v, j) => expect(logRelativeError(v, data.certified.params[j])).toBeGreaterThanOrEqual(6))
  })

  it('when given an analytic Jacobian for Misra1a then it reproduces the NIST StRD certified parameters', () => {
    const data = loadNistDataset('Misra1a')
    const result = fitLeastSquares(data.x, data.y, nistModels.Misra1a, {
      initialValues: data.start1,
      jacobian: ([b1, b2], x) => [1 - Math.exp(-b2 * x), b1 * x * Math.exp(-b2 * x)],
    })
    expect(result.converged).toBe(true)
    result.parameters.forEach((v, j) => expect(logRelativeError(v, data.certified.params[j])).toBeGreaterThanOrEqual(6))
  })
})
