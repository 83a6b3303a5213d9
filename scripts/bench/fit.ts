/**
 * Time per fitPeakGroup call on synthetic resonances: one Lorentzian over 50 samples, three blended Lorentzians over
 * 200 samples, and one Airy peak over 200 samples; noise of 1 % of the tallest peak.
 */
import { fitPeakGroup, type PeakGuess, type PeakGroupOptions } from '../../shared/fit'

const lorentzian = (x: number, c: number, h: number, w: number) => h / (1 + ((2 * (x - c)) / w) ** 2)

function noiseSource(seed: number): () => number {
  let state = seed >>> 0
  const uniform = () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0
    return (state + 0.5) / 4294967296
  }
  return () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform())
}

interface Case {
  name: string
  x: Float64Array
  y: Float64Array[]
  guesses: PeakGuess[]
  options: PeakGroupOptions
}

function makeCase(
  name: string,
  count: number,
  step: number,
  truth: (x: number) => number,
  guesses: PeakGuess[],
  options: PeakGroupOptions = {},
): Case {
  const noise = noiseSource(count * 7919)
  const x = Float64Array.from({ length: count }, (_, i) => i * step)
  const y = Array.from({ length: 32 }, () => Float64Array.from(x, (v) => truth(v) + 0.01 * noise()))
  return { name, x, y, guesses, options }
}

export default async function fitBenchmark(): Promise<void> {
  const cases: Case[] = [
    makeCase('1 Lorentzian, 50 samples', 50, 0.1, (v) => 0.05 + lorentzian(v, 2.5, 1, 0.6), [{ center: 2.4, height: 0.9, fwhm: 0.8 }]),
    makeCase(
      '3 Lorentzians, 200 samples',
      200,
      0.05,
      (v) => 0.05 + lorentzian(v, 4, 1, 0.6) + lorentzian(v, 4.8, 0.3, 0.6) + lorentzian(v, 6.5, 0.5, 0.6),
      [
        { center: 3.9, height: 0.9, fwhm: 0.8 },
        { center: 4.9, height: 0.4, fwhm: 0.5 },
        { center: 6.4, height: 0.6, fwhm: 0.7 },
      ],
    ),
    makeCase(
      '1 Airy (F = 10), 200 samples',
      200,
      0.05,
      (v) => 0.05 + 1 / (1 + (20 / Math.PI) ** 2 * Math.sin((Math.PI * (v - 5)) / 4) ** 2),
      [{ center: 5.1, height: 0.9, fwhm: 0.5 }],
      { model: 'airy', period: 4 },
    ),
  ]
  // CPU time beside wall time: on a shared machine the wall clock also counts other processes' turns.
  const rows: string[][] = [['case', 'calls', 'wall µs per call', 'CPU µs per call', 'mean iterations', 'converged']]
  for (const c of cases) {
    // Warm up the JIT before timing.
    for (let k = 0; k < 50; k++) fitPeakGroup(c.x, c.y[k % c.y.length], c.guesses, c.options)
    const calls = 2000
    let iterations = 0
    let converged = 0
    const cpuStart = process.cpuUsage()
    const start = performance.now()
    for (let k = 0; k < calls; k++) {
      const fit = fitPeakGroup(c.x, c.y[k % c.y.length], c.guesses, c.options)
      iterations += fit.iterations
      if (fit.converged) converged++
    }
    const elapsed = performance.now() - start
    const cpu = process.cpuUsage(cpuStart)
    rows.push([
      c.name,
      String(calls),
      ((elapsed * 1000) / calls).toFixed(1),
      ((cpu.user + cpu.system) / calls).toFixed(1),
      (iterations / calls).toFixed(1),
      `${converged}/${calls}`,
    ])
  }
  const widths = rows[0].map((_, j) => Math.max(...rows.map((r) => r[j].length)))
  for (const row of rows) console.log(row.map((cell, j) => cell.padEnd(widths[j])).join('  '))
}
