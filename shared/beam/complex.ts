/**
 * A tiny complex-number type for the beam parameter q (no dependency). Hot loops inline the arithmetic on plain
 * numbers instead of calling these helpers, so they allocate nothing.
 */
export interface Complex {
  re: number
  im: number
}

export const complex = (re: number, im: number): Complex => ({ re, im })
export const add = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im })
export const sub = (a: Complex, b: Complex): Complex => ({ re: a.re - b.re, im: a.im - b.im })
export const mul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re })
export const conj = (a: Complex): Complex => ({ re: a.re, im: -a.im })
export const abs2 = (a: Complex): number => a.re * a.re + a.im * a.im

export function div(a: Complex, b: Complex): Complex {
  const den = b.re * b.re + b.im * b.im
  return { re: (a.re * b.re + a.im * b.im) / den, im: (a.im * b.re - a.re * b.im) / den }
}

export const inv = (a: Complex): Complex => div({ re: 1, im: 0 }, a)
