import { assertPositive } from './assertions'

/** Speed of light in vacuum, m/s (exact, SI definition). */
export const SPEED_OF_LIGHT_M_PER_S = 299_792_458

/**
 * Free spectral range of a linear two-mirror cavity with an air/vacuum gap, FSR = c / (2 L).
 * Source: Siegman, "Lasers" (1986), ch. 11; Kogelnik & Li, Appl. Opt. 5, 1550 (1966).
 */
export function freeSpectralRangeHz(lengthM: number): number {
  assertPositive(lengthM, 'lengthM')
  return SPEED_OF_LIGHT_M_PER_S / (2 * lengthM)
}
