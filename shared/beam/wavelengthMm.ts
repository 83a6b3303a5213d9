/** Nanometres to millimetres: the beam module works in millimetres throughout (table scale). */
export function wavelengthMm(wavelengthNm: number): number {
  return wavelengthNm * 1e-6
}
