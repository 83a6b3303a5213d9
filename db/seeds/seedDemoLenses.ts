/**
 * The invented demo lab's lens kit (31 kinds of lens, stock focal lengths 25–1000 mm, one to three of each) and one
 * saved mode-matching plan for the 1064 nm reference cavity, computed here with the real planner. Idempotent: lenses
 * are added by label, the plan only when that cavity has none.
 */
import type { Knex } from 'knex'
import type { LensInput, LensType } from '../../shared/api/plannerSchemas'
import { planRequestSchema, planSaveSchema } from '../../shared/api/plannerSchemas'
import { planForCavity, savePlan } from '../../server/plans/planService'

const nir = { wavelengthMinNm: 650, wavelengthMaxNm: 1100 }
const visible = { wavelengthMinNm: 400, wavelengthMaxNm: 700 }
const broadband = { wavelengthMinNm: 350, wavelengthMaxNm: 1100 }
const uncoated = { wavelengthMinNm: null, wavelengthMaxNm: null }

function lens(label: string, focalLengthMm: number, count: number, type: LensType, range: Pick<LensInput, 'wavelengthMinNm' | 'wavelengthMaxNm'>, notes = ''): LensInput {
  return { label, focalLengthMm, count, type, ...range, notes }
}

export const demoLenses: LensInput[] = [
  ...[25, 30, 40, 50, 60, 75, 100, 125, 150, 175, 200, 250, 300, 400, 500, 750, 1000].map((f, i) =>
    lens(`PCX-${f}`, f, 1 + (i % 3), 'plano-convex', f >= 500 ? broadband : nir, f === 100 ? 'one has a chip at the edge; keep the good one for the lock path' : ''),
  ),
  lens('BCX-35', 35, 2, 'bi-convex', uncoated, 'for telescopes in the fibre launch'),
  lens('BCX-50', 50, 1, 'bi-convex', nir),
  lens('BCX-100', 100, 2, 'bi-convex', nir),
  lens('BCX-150', 150, 1, 'bi-convex', visible),
  lens('PCV-25', -25, 1, 'plano-concave', nir),
  lens('PCV-50', -50, 2, 'plano-concave', nir),
  lens('PCV-75', -75, 1, 'plano-concave', broadband),
  lens('PCV-100', -100, 2, 'plano-concave', nir),
  lens('PCV-150', -150, 1, 'plano-concave', visible),
  lens('ACH-60', 60, 1, 'achromat', visible),
  lens('ACH-100', 100, 2, 'achromat', { wavelengthMinNm: 700, wavelengthMaxNm: 1100 }),
  lens('ACH-200', 200, 1, 'achromat', visible, 'drawer 2, left'),
  lens('CYL-100', 100, 1, 'cylindrical', nir, 'for the diode laser’s elliptical beam'),
  lens('CYL-200', 200, 1, 'cylindrical', nir),
]

export async function seedDemoLenses(knex: Knex): Promise<void> {
  for (const item of demoLenses) {
    await knex('lenses')
      .insert({
        label: item.label,
        focal_length_mm: item.focalLengthMm,
        count: item.count,
        type: item.type,
        wavelength_min_nm: item.wavelengthMinNm,
        wavelength_max_nm: item.wavelengthMaxNm,
        notes: item.notes,
      })
      .onConflict('label')
      .ignore()
  }
  const cavity = await knex('cavities').where({ name: 'REF-1064 reference cavity' }).first('id')
  const author = await knex('users').where({ email: 'experimenter@demo.cavitrace.test' }).first('id', 'email', 'name', 'role')
  if (!cavity || !author) return
  if (await knex('mode_matching_plans').where({ cavity_id: cavity.id }).first('id')) return
  // The laser head's beam as measured on the demo table: a 0.35 mm waist 40 mm inside the laser.
  const inputs = planRequestSchema.parse({
    beam: { kind: 'waist', x: { waistRadiusMm: 0.35, waistPositionMm: -40 } },
    table: { laserToCavityMm: 700, lensZonesMm: [[80, 300], [350, 620]], minSpacingMm: 25, positionStepMm: 1 },
    couplingTarget: 0.98,
  })
  const answer = await planForCavity(knex, cavity.id as string, inputs, { inThread: false })
  const best = answer.arrangements.find((a) => a.kind === 'two-lens') ?? answer.arrangements[0]
  if (!best) return
  await savePlan(
    knex,
    cavity.id as string,
    planSaveSchema.parse({
      inputs,
      lenses: best.lenses.map((l) => ({ lensId: l.lensId, zMm: l.zMm })),
      note: 'Demo plan: the pair that survives ±1 mm mount play best. L1 sits on the rail after the isolator.',
    }),
    { id: author.id as number, email: author.email as string, name: author.name as string, role: author.role, via: 'session' },
  )
}
