import { describe, expect, it } from 'vitest'
import {
  airyTransmission,
  eigenmodeWaist,
  finesseFromReflectivities,
  freeSpectralRangeHz,
  gouyPhaseOneWay,
  gParameters,
  mirrorSpotRadii,
  transverseOffsetFsr,
} from '../../../shared/cavity'
import { EngineError } from '../../../shared/errors'
import { expectPrintedDigits, significantDigits } from './digits'

// Check values: the project's optics reference (OPTICS-CHECKS.md §2(a)–(c)), computed there with numpy/scipy and
// cross-checked by an independent route; quoted here exactly as printed there. Each block names the published
// source of the formula as that file does.

interface GouyRow {
  name: string
  lengthM: number
  roc1M: number | null
  roc2M: number | null
  g1: string
  g2: string
  psiRad: string
  psiOverPi: string
  fsrHz: string
  offsets: [string, string, string, string]
}

// Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, "Lasers" (1986), ch. 19; sign rule for negative g
// from K. Arai, LIGO-T1300189 (2013), Eqs. (1)–(5).
const gouyRows: GouyRow[] = [
  { name: 'confocal', lengthM: 0.05, roc1M: 0.05, roc2M: 0.05, g1: '0', g2: '0', psiRad: '1.57079633', psiOverPi: '0.5', fsrHz: '2997924580', offsets: ['0.5', '0', '0.5', '0'] },
  { name: 'half-confocal', lengthM: 0.05, roc1M: null, roc2M: 0.1, g1: '1', g2: '0.5', psiRad: '0.785398163', psiOverPi: '0.25', fsrHz: '2997924580', offsets: ['0.25', '0.5', '0.75', '0'] },
  { name: 'plano-concave', lengthM: 0.1, roc1M: null, roc2M: 0.5, g1: '1', g2: '0.8', psiRad: '0.463647609', psiOverPi: '0.147583618', fsrHz: '1498962290', offsets: ['0.1475836', '0.2951672', '0.4427509', '0.5903345'] },
  { name: 'symmetric', lengthM: 0.1, roc1M: 0.25, roc2M: 0.25, g1: '0.6', g2: '0.6', psiRad: '0.927295218', psiOverPi: '0.295167235', fsrHz: '1498962290', offsets: ['0.2951672', '0.5903345', '0.8855017', '0.1806689'] },
  { name: 'asymmetric', lengthM: 0.2, roc1M: 0.5, roc2M: 1, g1: '0.6', g2: '0.8', psiRad: '0.805403501', psiOverPi: '0.256367897', fsrHz: '749481145', offsets: ['0.2563679', '0.5127358', '0.7691037', '0.02547159'] },
  { name: 'near-planar', lengthM: 0.1, roc1M: 10, roc2M: 10, g1: '0.99', g2: '0.99', psiRad: '0.141539473', psiOverPi: '0.0450534136', fsrHz: '1498962290', offsets: ['0.04505341', '0.09010683', '0.1351602', '0.1802137'] },
  { name: 'near-concentric (g < 0)', lengthM: 0.1, roc1M: 0.052, roc2M: 0.052, g1: '-0.92307692', g2: '-0.92307692', psiRad: '2.74680153', psiOverPi: '0.874334084', fsrHz: '1498962290', offsets: ['0.8743341', '0.7486682', '0.6230023', '0.4973363'] },
  { name: 'long arm, near-flat input mirror', lengthM: 38.55, roc1M: 1e6, roc2M: 57.1, g1: '0.99996145', g2: '0.32486865', psiRad: '0.964337311', psiOverPi: '0.3069581', fsrHz: '3888358.729', offsets: ['0.3069581', '0.6139162', '0.9208743', '0.2278324'] },
]

describe('g-parameters, Gouy phase and transverse-mode offsets (OPTICS-CHECKS.md §2(a); Kogelnik & Li 1966; Siegman 1986 ch. 19)', () => {
  for (const row of gouyRows) {
    it(`when the cavity is ${row.name} then g, ψ, FSR and the order 1–4 offsets match the check values`, () => {
      const { g1, g2 } = gParameters(row.lengthM, row.roc1M, row.roc2M)
      expectPrintedDigits(g1, row.g1)
      expectPrintedDigits(g2, row.g2)
      const psi = gouyPhaseOneWay(g1, g2)
      expectPrintedDigits(psi, row.psiRad)
      expectPrintedDigits(psi / Math.PI, row.psiOverPi)
      expectPrintedDigits(freeSpectralRangeHz(row.lengthM), row.fsrHz)
      row.offsets.forEach((printed, k) => expectPrintedDigits(transverseOffsetFsr(k + 1, psi), printed))
    })
  }

  it('when the check values are quoted then each ψ carries at least 6 significant digits', () => {
    for (const row of gouyRows) expect(significantDigits(row.psiRad)).toBeGreaterThanOrEqual(6)
  })

  it('when the symmetric example (L = 0.1 m, R = 0.25 m) is used then orders 1–6 sit at the quoted offsets in MHz', () => {
    const { g1, g2 } = gParameters(0.1, 0.25, 0.25)
    const psi = gouyPhaseOneWay(g1, g2)
    const fsr = freeSpectralRangeHz(0.1)
    const printed = ['442.444555', '884.88911', '1327.33366', '270.81593', '713.260485', '1155.70504']
    printed.forEach((mhz, k) => expectPrintedDigits((transverseOffsetFsr(k + 1, psi) * fsr) / 1e6, mhz))
  })

  it('when the long arm cavity is used then orders 1–6 sit at the quoted offsets in MHz', () => {
    const { g1, g2 } = gParameters(38.55, 1e6, 57.1)
    const psi = gouyPhaseOneWay(g1, g2)
    const fsr = freeSpectralRangeHz(38.55)
    const printed = ['1.193563', '2.387126', '3.58069', '0.8858941', '2.079457', '3.273021']
    printed.forEach((mhz, k) => expectPrintedDigits((transverseOffsetFsr(k + 1, psi) * fsr) / 1e6, mhz))
  })

  it('when g is negative then ψ uses arccos(−√(g1g2)) and order 1 is not mirrored to 0.1256659 FSR', () => {
    // OPTICS-CHECKS.md §3 pitfall 1: the naive arccos(+√) gives the mirror-image position.
    const { g1, g2 } = gParameters(0.1, 0.052, 0.052)
    const psi = gouyPhaseOneWay(g1, g2)
    expect(psi).toBeGreaterThan(Math.PI / 2)
    expectPrintedDigits(1 - transverseOffsetFsr(1, psi), '0.1256659')
  })

  it('when the cavity is confocal then even orders fold exactly to 0, never to 0.99999…', () => {
    const psi = gouyPhaseOneWay(0, 0)
    for (const order of [0, 2, 4, 6, 8, 10]) expect(transverseOffsetFsr(order, psi)).toBe(0)
    for (const order of [1, 3, 5, 7]) expect(transverseOffsetFsr(order, psi)).toBeCloseTo(0.5, 12)
  })

  it('when the geometry is unstable then gouyPhaseOneWay throws unstable_cavity naming g1, g2 and their product', () => {
    const cases: Array<[number, number, number, string]> = [
      // [L, R1, R2, product as printed]: OPTICS-CHECKS.md §2(a) last two rows.
      [0.3, 0.1, 0.1, '4'],
      [0.25, 0.2, 1, '-0.1875'],
    ]
    for (const [lengthM, r1, r2, product] of cases) {
      const { g1, g2 } = gParameters(lengthM, r1, r2)
      try {
        gouyPhaseOneWay(g1, g2)
        expect.unreachable()
      } catch (error) {
        expect(error).toBeInstanceOf(EngineError)
        expect((error as EngineError).code).toBe('unstable_cavity')
        expect((error as EngineError).message).toContain(`g1·g2 = ${product}`)
        expect((error as EngineError).message).toContain(`g1 = ${Number(g1.toPrecision(6))}`)
      }
    }
  })

  it('when the unstable rows are used then the FSR still matches the check values', () => {
    expectPrintedDigits(freeSpectralRangeHz(0.3), '499654096.7')
    expectPrintedDigits(freeSpectralRangeHz(0.25), '599584916')
  })
})

interface EigenRow {
  name: string
  wavelengthNm: number
  lengthM: number
  roc1M: number | null
  roc2M: number | null
  w0Um: string
  z1M: string
  zRM: string
  w1Um: string
  w2Um: string
}

// Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, "Lasers" (1986), ch. 19 (g-form eigenmode).
const eigenRows: EigenRow[] = [
  { name: 'symmetric', wavelengthNm: 1064, lengthM: 0.1, roc1M: 0.25, roc2M: 0.25, w0Um: '184.0331', z1M: '0.05', zRM: '0.1', w1Um: '205.7552', w2Um: '205.7552' },
  { name: 'confocal, 633 nm', wavelengthNm: 633, lengthM: 0.1, roc1M: 0.1, roc2M: 0.1, w0Um: '100.3718', z1M: '0.05', zRM: '0.05', w1Um: '141.9472', w2Um: '141.9472' },
  { name: 'confocal, 50 mm', wavelengthNm: 632.8, lengthM: 0.05, roc1M: 0.05, roc2M: 0.05, w0Um: '70.9624', z1M: '0.025', zRM: '0.025', w1Um: '100.356', w2Um: '100.356' },
  { name: 'asymmetric', wavelengthNm: 1064, lengthM: 0.2, roc1M: 0.5, roc2M: 1, w0Um: '277.3293', z1M: '0.1454545', zRM: '0.2270908', w1Um: '329.3402', w2Um: '285.217' },
  { name: 'plano-concave (waist on the flat)', wavelengthNm: 1064, lengthM: 0.1, roc1M: null, roc2M: 0.5, w0Um: '260.2621', z1M: '0', zRM: '0.2', w1Um: '260.2621', w2Um: '290.9818' },
  { name: 'near-concentric', wavelengthNm: 1064, lengthM: 0.1, roc1M: 0.052, roc2M: 0.052, w0Um: '58.19637', z1M: '0.05', zRM: '0.01', w1Um: '296.7444', w2Um: '296.7444' },
  { name: 'near-planar', wavelengthNm: 1064, lengthM: 0.1, roc1M: 10, roc2M: 10, w0Um: '488.7583', z1M: '0.05', zRM: '0.7053368', w1Um: '489.9848', w2Um: '489.9848' },
]

describe('cavity eigenmode and spot sizes (OPTICS-CHECKS.md §2(b); Kogelnik & Li 1966; Siegman 1986 ch. 19)', () => {
  for (const row of eigenRows) {
    it(`when the cavity is ${row.name} then waist, waist position, Rayleigh range and mirror spots match`, () => {
      const { g1, g2 } = gParameters(row.lengthM, row.roc1M, row.roc2M)
      const wavelengthM = row.wavelengthNm * 1e-9
      const waist = eigenmodeWaist(row.lengthM, wavelengthM, g1, g2)
      expectPrintedDigits(waist.radiusM * 1e6, row.w0Um)
      expectPrintedDigits(waist.positionFromMirror1M, row.z1M)
      expectPrintedDigits(waist.rayleighRangeM, row.zRM)
      const spots = mirrorSpotRadii(row.lengthM, wavelengthM, g1, g2)
      expectPrintedDigits(spots.mirror1 * 1e6, row.w1Um)
      expectPrintedDigits(spots.mirror2 * 1e6, row.w2Um)
    })
  }

  it('when the cavity is symmetric confocal then the mirror spot is √2 times the waist (Siegman 1986 ch. 19)', () => {
    const waist = eigenmodeWaist(0.05, 632.8e-9, 0, 0)
    const spots = mirrorSpotRadii(0.05, 632.8e-9, 0, 0)
    expect(spots.mirror1 / waist.radiusM).toBeCloseTo(Math.SQRT2, 12)
  })

  it('when the waist is computed then w0² = λ z_R / π holds (Siegman 1986 ch. 17)', () => {
    const waist = eigenmodeWaist(0.2, 1064e-9, 0.6, 0.8)
    expect((Math.PI * waist.radiusM ** 2) / 1064e-9 / waist.rayleighRangeM).toBeCloseTo(1, 12)
  })
})

// Source: Born & Wolf, "Principles of Optics", §7.6; Saleh & Teich, "Fundamentals of Photonics" (1991),
// resonator-optics chapter: 𝓕 = π r^(1/2) / (1 − r), r = √(R1 R2).
describe('finesse and the Airy function (OPTICS-CHECKS.md §2(c); Born & Wolf §7.6; Saleh & Teich 1991)', () => {
  const finesseRows: Array<[number, string, string]> = [
    // [R, 𝓕 = π√R/(1−R), 𝓕_exact from the Airy FWHM]
    [0.5, '4.44288294', '4.34681581'],
    [0.9, '29.8037648', '29.7899559'],
    [0.99, '312.584522', '312.583207'],
    [0.999, '3140.02146', '3140.02133'],
    [0.9999, '31414.3557', '31414.3557'],
  ]

  for (const [reflectivity, finesse, exactFinesse] of finesseRows) {
    it(`when both mirrors have R = ${reflectivity} then the finesse is ${finesse} and the Airy half maximum sits at π/𝓕_exact`, () => {
      const computed = finesseFromReflectivities(reflectivity, reflectivity)
      expectPrintedDigits(computed, finesse)
      // The exact Airy FWHM in round-trip phase is 2π/𝓕_exact, so the half maximum lies π/𝓕_exact from resonance.
      expect(airyTransmission(Math.PI / Number(exactFinesse), computed)).toBeCloseTo(0.5, 6)
    })
  }

  it('when the mirrors differ (R1 = 0.99, R2 = 0.999) then the finesse is 568.570306', () => {
    expectPrintedDigits(finesseFromReflectivities(0.99, 0.999), '568.570306')
  })

  it('when L = 0.1 m and R = 0.99 then FSR and linewidth match the worked example', () => {
    const fsr = freeSpectralRangeHz(0.1)
    expectPrintedDigits(fsr / 1e9, '1.49896229')
    expectPrintedDigits(fsr / finesseFromReflectivities(0.99, 0.99) / 1e6, '4.79538231')
  })

  it('when the detuning is given in linewidths (R = 0.99) then the Airy transmission matches the table', () => {
    const finesse = finesseFromReflectivities(0.99, 0.99)
    // A detuning of x linewidths is a round-trip phase of 2π·x/𝓕.
    const rows: Array<[number, string]> = [
      [0.5, '0.500002104'],
      [1, '0.200005387'],
      [5, '0.00990924585'],
      [10, '0.00250215804'],
    ]
    for (const [linewidths, printed] of rows) expectPrintedDigits(airyTransmission((2 * Math.PI * linewidths) / finesse, finesse), printed)
    // Anti-resonance (δ = π): (1 − R)² / (1 + R)².
    expectPrintedDigits(airyTransmission(Math.PI, finesse), '2.52518876e-05')
  })

  it('when exactly on resonance then the Airy transmission is 1', () => {
    expect(airyTransmission(0, 100)).toBe(1)
    expect(airyTransmission(2 * Math.PI, 100)).toBeCloseTo(1, 12)
  })

  it('when a reflectivity is given in percent then finesseFromReflectivities refuses it', () => {
    expect(() => finesseFromReflectivities(99, 0.99)).toThrow('reflectivity1 must be strictly between 0 and 1, got 99')
  })
})
