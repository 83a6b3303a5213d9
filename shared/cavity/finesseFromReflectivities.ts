import { assertOpenUnitInterval } from './assertions'

/**
 * Finesse of a lossless two-mirror cavity from the power reflectivities, F = π (R1 R2)^(1/4) / (1 − √(R1 R2)).
 * This is the Lorentzian-limit finesse (FSR / FWHM to second order in detuning), not the exact Airy FWHM ratio.
 * Source: Born & Wolf, "Principles of Optics", §7.6; Saleh & Teich, "Fundamentals of Photonics" (1991), ch. 9.
 */
export function finesseFromReflectivities(reflectivity1: number, reflectivity2: number): number {
  assertOpenUnitInterval(reflectivity1, 'reflectivity1')
  assertOpenUnitInterval(reflectivity2, 'reflectivity2')
  const r = Math.sqrt(reflectivity1 * reflectivity2)
  return (Math.PI * Math.sqrt(r)) / (1 - r)
}
