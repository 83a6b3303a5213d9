import { describe, expect, it } from 'vitest'
import type { AnalysisPeak } from '../../../shared/analysis/types'
import { formatFrequency, formatLength, formatPercent, formatSeconds } from '../../../src/components/analysis/formatQuantity'
import { orderColour, peakColour, peakLabel } from '../../../src/components/analysis/orderPalette'
import { peaksToCsv } from '../../../src/components/analysis/peaksToCsv'

function peak(overrides: Partial<AnalysisPeak> = {}): AnalysisPeak {
  return { t: 0.00125, order: 0, kind: 'carrier', height: 1.2, heightError: 0.003, fwhmSeconds: 2.5e-6, area: 4.7e-6, share: 0.86, positionFsr: 0, fitted: true, ...overrides }
}

describe('peaksToCsv', () => {
  it('when peaks are exported then the header and one row per peak come out with full-precision numbers', () => {
    const csv = peaksToCsv([peak(), peak({ order: null, kind: 'unassigned', positionFsr: null, heightError: null, share: 0 })])
    const lines = csv.split('\r\n')
    expect(lines[0]).toBe('order,kind,t_s,position_fsr,height_V,height_error_V,fwhm_s,area_Vs,share,fitted')
    expect(lines[1]).toBe('0,carrier,0.00125,0,1.2,0.003,0.0000025,0.0000047,0.86,true')
    expect(lines[2]).toBe(',unassigned,0.00125,,1.2,,0.0000025,0.0000047,0,true')
    expect(lines[3]).toBe('') // RFC 4180 ends each record with CRLF
  })
})

describe('orderPalette', () => {
  it('when orders 0–6 are coloured then each gets a distinct Okabe–Ito based colour and higher orders share grey', () => {
    // Okabe & Ito, "Color Universal Design" (2008): blue #0072B2, vermillion #D55E00, bluish green #009E73.
    expect(orderColour(0)).toBe('#0072B2')
    expect(orderColour(1)).toBe('#D55E00')
    expect(orderColour(2)).toBe('#009E73')
    const colours = [0, 1, 2, 3, 4, 5, 6].map(orderColour)
    expect(new Set(colours).size).toBe(7)
    expect(orderColour(9)).toBe(orderColour(null))
  })

  it('when a resonance is a sideband or unassigned then its label and colour say so', () => {
    expect(peakLabel(peak({ kind: 'sideband', order: 0 }))).toBe('SB0')
    expect(peakLabel(peak({ kind: 'unassigned', order: null }))).toBe('?')
    expect(peakLabel(peak({ order: 3 }))).toBe('3')
    expect(peakColour(peak({ kind: 'sideband', order: 1 }))).not.toBe(orderColour(1))
  })
})

describe('formatQuantity', () => {
  it('when quantities are shown then the prefix keeps 3–4 significant digits', () => {
    // FSR of a 100 mm cavity: c / 2L = 1.49896229 GHz (c exact by SI definition).
    expect(formatFrequency(1.49896229e9)).toBe('1.499\u00a0GHz')
    expect(formatFrequency(312_400)).toBe('312.4\u00a0kHz')
    expect(formatLength(2.315e-4)).toBe('231.5\u00a0µm')
    expect(formatLength(0.05)).toBe('50\u00a0mm')
    expect(formatPercent(0.8623)).toBe('86.2\u00a0%')
    expect(formatSeconds(1.25e-5)).toBe('12.5\u00a0µs')
    expect(formatFrequency(null)).toBe('—')
  })
})
