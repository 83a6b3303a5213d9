/** A deterministic pseudo-random source: uniform numbers in [0, 1) and standard normal deviates. */
export interface SeededRandom {
  uniform(): number
  normal(): number
}

/**
 * Seeded generator, so that a synthetic trace is reproducible from its seed (no Math.random).
 * Uniforms: the 32-bit "mulberry32" mixing generator (public-domain construction; common practice for
 * small reproducible simulations). Normals: the Box–Muller transform (Box & Muller, Ann. Math. Stat. 29, 610 (1958)).
 */
export function createRandom(seed: number): SeededRandom {
  let state = (Math.trunc(seed) ^ 0x9e3779b9) >>> 0
  let spare = 0
  let hasSpare = false

  const uniform = (): number => {
    state = (state + 0x6d2b79f5) >>> 0
    let z = state
    z = Math.imul(z ^ (z >>> 15), z | 1)
    z ^= z + Math.imul(z ^ (z >>> 7), z | 61)
    return ((z ^ (z >>> 14)) >>> 0) / 4294967296
  }

  const normal = (): number => {
    if (hasSpare) {
      hasSpare = false
      return spare
    }
    // 1 − u keeps the logarithm's argument in (0, 1].
    const radius = Math.sqrt(-2 * Math.log(1 - uniform()))
    const angle = 2 * Math.PI * uniform()
    spare = radius * Math.sin(angle)
    hasSpare = true
    return radius * Math.cos(angle)
  }

  return { uniform, normal }
}
