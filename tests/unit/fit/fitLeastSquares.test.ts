import { describe, expect, it } from 'vitest'
import { fitLeastSquares } from '../../../shared/fit'
import { EngineError } from '../../../shared/errors'

const line = (p: number[]) => (x: number) => p[0] + p[1] * x

describe('fitLeastSquares behaviour', () => {
  it('when the data lie exactly on the model then it recovers the parameters and reports a zero RSS', () => {
    const x = [0, 1, 2, 3, 4]
    const y = x.map((v) => 2 + 0.5 * v)
    const result = fitLeastSquares(x, y, line, { initialValues: [0, 0] })
    expect(result.converged).toBe(true)
    expect(result.parameters[0]).toBeCloseTo(2, 10)
    expect(result.parameters[1]).toBeCloseTo(0.5, 10)
    expect(result.residualSumOfSquares).toBeLessThan(1e-20)
  })

  it('when fitting a straight line then the standard errors equal the textbook closed form', () => {
    // Closed-form OLS standard errors: Draper & Smith, "Applied Regression Analysis" (1998), ch. 1.
    const x = [1, 2, 3, 4, 5, 6]
    const y = [1.1, 1.9, 3.2, 3.9, 5.1, 5.8]
    const result = fitLeastSquares(x, y, line, { initialValues: [0, 1] })
    const n = x.length
    const meanX = x.reduce((a, b) => a + b) / n
    const sxx = x.reduce((a, v) => a + (v - meanX) ** 2, 0)
    const s2 = result.residualSumOfSquares / (n - 2)
    expect(result.standardErrors[1]).toBeCloseTo(Math.sqrt(s2 / sxx), 10)
    expect(result.standardErrors[0]).toBeCloseTo(Math.sqrt(s2 * (1 / n + meanX ** 2 / sxx)), 10)
  })

  it('when weights are given then a heavily weighted sample pulls the fit and the RSS is weighted', () => {
    const x = [0, 1, 2]
    const y = [0, 0, 3]
    const flat = (p: number[]) => () => p[0]
    const result = fitLeastSquares(x, y, flat, { initialValues: [0], weights: [1, 1, 1e6] })
    // Weighted mean (common practice): Σwy/Σw.
    expect(result.parameters[0]).toBeCloseTo((3 * 1e6) / (1e6 + 2), 8)
    expect(result.residualSumOfSquares).toBeCloseTo(2 * result.parameters[0] ** 2 + 1e6 * (3 - result.parameters[0]) ** 2, 6)
  })

  it('when bounds exclude the unconstrained optimum then the result stays inside them', () => {
    const x = [0, 1, 2, 3]
    const y = [5, 5, 5, 5]
    const result = fitLeastSquares(x, y, (p) => () => p[0], { initialValues: [1], maxValues: [3] })
    expect(result.parameters[0]).toBeLessThanOrEqual(3)
    expect(result.parameters[0]).toBeCloseTo(3, 10)
  })

  it('when a parameter has no effect on the model then it reports converged: false', () => {
    const x = [0, 1, 2, 3]
    const y = [1, 2, 3, 4.1]
    const result = fitLeastSquares(x, y, (p) => (v) => p[0] + p[1] * v + 0 * p[2], { initialValues: [0, 0, 1] })
    expect(result.converged).toBe(false)
    expect(result.message).toMatch(/parameter 2/)
  })

  it('when given fewer samples than parameters then it throws too_few_samples', () => {
    expect(() => fitLeastSquares([1], [1], line, { initialValues: [0, 0] })).toThrow(EngineError)
    try {
      fitLeastSquares([1], [1], line, { initialValues: [0, 0] })
    } catch (error) {
      expect((error as EngineError).code).toBe('too_few_samples')
    }
  })

  it('when x and y differ in length then it throws with a message naming both lengths', () => {
    expect(() => fitLeastSquares([1, 2, 3], [1, 2], line, { initialValues: [0, 0] })).toThrow(
      'x and y must have the same length, got 3 and 2',
    )
  })

  it('when the model is not finite at the start then it throws non_finite_model', () => {
    expect(() => fitLeastSquares([1, 2, 3], [1, 2, 3], (p) => (x) => Math.log(p[0]) * x, { initialValues: [-1] })).toThrow(
      'The model gives a non-finite value at the initial parameters',
    )
  })

  it('when the iteration budget is too small then it says so and reports converged: false', () => {
    const x = Array.from({ length: 20 }, (_, i) => i)
    const y = x.map((v) => 3 * Math.exp(-0.2 * v))
    const result = fitLeastSquares(x, y, (p) => (v) => p[0] * Math.exp(-p[1] * v), { initialValues: [1, 1], maxIterations: 1 })
    expect(result.converged).toBe(false)
    expect(result.message).toMatch(/maximum of 1 iterations/)
  })
})
