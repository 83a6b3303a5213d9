/**
 * Mode-matching planner: two-lens search over a 40-lens kit on a 1 mm position grid (600 mm path, two 200 mm zones,
 * 10 mm spacing), for a circular and an astigmatic beam. Prints the time of the whole plan (search, tolerances, ideal
 * lenses) and of the search alone, and how many arrangements were evaluated. Target: whole plan under 1 s.
 */
import { loadavg } from 'node:os'
import { cavityEigenmodeBeam, planModeMatching, searchKitArrangements, type Beam, type KitLens } from '../../shared/beam'

const cavity = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 }
const table = { laserToCavityMm: 600, lensZonesMm: [[50, 250], [300, 500]] as [number, number][], minSpacingMm: 10, positionStepMm: 1 }
const stock = [25, 30, 40, 50, 60, 75, 100, 125, 150, 175, 200, 250, 300, 400, 500, 750, 1000, -50, -75, -100]
const kit: KitLens[] = [...stock, ...stock.map((f) => Math.round(f * 1.1))].map((f, i) => ({ id: `L${i}`, focalLengthMm: f, count: 1 + (i % 2) }))

const circular: Beam = { wavelengthNm: 1064, x: { waistRadiusMm: 0.45, waistPositionMm: -30, m2: 1 }, y: { waistRadiusMm: 0.45, waistPositionMm: -30, m2: 1 } }
const astigmatic: Beam = { ...circular, y: { waistRadiusMm: 0.55, waistPositionMm: 10, m2: 1.1 } }

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.floor(sorted.length / 2)]
}

export default async function plannerBenchmark(): Promise<void> {
  const rows: string[][] = []
  for (const [name, beam] of [['circular beam', circular], ['astigmatic beam', astigmatic]] as const) {
    planModeMatching({ cavity, beam, kit, table }) // warm-up (JIT)
    const planMs: number[] = []
    const searchMs: number[] = []
    let evaluated = 0
    let best = 0
    const path = { beam, target: cavityEigenmodeBeam(cavity), cavityPlaneMm: table.laserToCavityMm }
    const positions = Float64Array.from([...Array.from({ length: 201 }, (_, i) => 50 + i), ...Array.from({ length: 201 }, (_, i) => 300 + i)])
    const powers = Float64Array.from(kit, (l) => 1 / l.focalLengthMm)
    const counts = Int32Array.from(kit, (l) => l.count)
    for (let run = 0; run < 5; run++) {
      let t0 = performance.now()
      const plan = planModeMatching({ cavity, beam, kit, table })
      planMs.push(performance.now() - t0)
      evaluated = plan.evaluated.oneLens + plan.evaluated.twoLens
      best = Math.max(...plan.arrangements.map((a) => a.coupling))
      t0 = performance.now()
      searchKitArrangements(path, powers, counts, positions, table.minSpacingMm)
      searchMs.push(performance.now() - t0)
    }
    rows.push([name, String(kit.length), evaluated.toLocaleString('en-US'), median(searchMs).toFixed(0), median(planMs).toFixed(0), Math.min(...planMs).toFixed(0), (100 * best).toFixed(3)])
  }
  const header = ['case', 'lenses', 'arrangements evaluated', 'search ms (median)', 'whole plan ms (median)', 'whole plan ms (best)', 'best coupling %']
  console.log(`| ${header.join(' | ')} |`)
  console.log(`|${header.map(() => '---').join('|')}|`)
  for (const row of rows) console.log(`| ${row.join(' | ')} |`)
  console.log(`(1 mm grid, 402 positions; 5 runs each after one warm-up; load average ${loadavg().map((v) => v.toFixed(1)).join(', ')})`)
}
