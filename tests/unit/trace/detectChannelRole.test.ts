import { describe, expect, it } from 'vitest'
import { detectChannelRole } from '../../../shared/trace/detectChannelRole'
import { makeSweptTrace } from './makeSweptTrace'

// The role rules are common practice in swept-cavity work (no published source): a ramp monitor is smooth,
// transmission is a low baseline with narrow peaks, reflection a high level with narrow dips.
describe('detectChannelRole', () => {
  const [ramp, transmission, reflection] = makeSweptTrace({ sampleCount: 5000, sweeps: 3 }).channels

  it('when the signal is a sawtooth then ramp', () => {
    expect(detectChannelRole(ramp.values).role).toBe('ramp')
  })

  it('when the signal is a triangle then ramp', () => {
    const triangle = Float64Array.from({ length: 4000 }, (_, i) => Math.abs(((i / 1000) % 2) - 1))
    expect(detectChannelRole(triangle).role).toBe('ramp')
  })

  it('when the signal is a baseline with narrow positive peaks then transmission, with evidence', () => {
    const guess = detectChannelRole(transmission.values)
    expect(guess.role).toBe('transmission')
    expect(guess.evidence).toMatch(/baseline/)
  })

  it('when the signal is high with narrow dips then reflection', () => {
    expect(detectChannelRole(reflection.values).role).toBe('reflection')
  })

  it('when the signal is constant or white noise then unknown', () => {
    expect(detectChannelRole(new Float64Array(100).fill(0.3)).role).toBe('unknown')
    let seed = 12345
    const noise = Float64Array.from({ length: 5000 }, () => {
      seed = (seed * 1103515245 + 12345) % 2147483648
      return seed / 2147483648
    })
    expect(detectChannelRole(noise).role).toBe('unknown')
  })

  it('when a few samples are NaN then the guess is unchanged', () => {
    const damaged = ramp.values.slice()
    damaged[10] = NaN
    damaged[2000] = NaN
    expect(detectChannelRole(damaged).role).toBe('ramp')
  })
})
