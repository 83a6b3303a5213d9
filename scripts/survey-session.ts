/**
 * `npx tsx scripts/survey-session.ts [SEED_BASE …]`: the tuning-session accuracy cases (tests/unit/accuracy/
 * sessionCases.ts) drawn again from other seed bases — each base draws a new set of 100 cases of the same mix.
 * Prints one line per case that is more than 3 points off, then per base the table by TEM00 band. The suite's own
 * base is 7100 (tuned on); 20000 and up are kept for checking and never tuned on. Not part of `npm test`.
 */
import { bandFigures, evaluateSessionCase } from '../tests/unit/accuracy/evaluateSessionCase'
import { sessionCase, SESSION_CASE_COUNT } from '../tests/unit/accuracy/sessionCases'

const bases = process.argv.slice(2).map(Number)
if (bases.length === 0) bases.push(20000, 30000, 40000)
if (bases.some((b) => !Number.isInteger(b) || b < 0)) {
  console.error('Seed bases must be non-negative integers, e.g. `npx tsx scripts/survey-session.ts 20000 30000`.')
  process.exit(2)
}

const tables: string[] = []
for (const base of bases) {
  const outcomes = Array.from({ length: SESSION_CASE_COUNT }, (_, k) => evaluateSessionCase(k, sessionCase(k, base)))
  for (const o of outcomes) if (!(o.errorPoints <= 3)) console.log(`base ${base} ${o.row}`)
  const lengthCases = outcomes.filter((o) => o.effect === 'length-off' && o.transverseLabels >= 2)
  const lengthRight = lengthCases.filter((o) => o.impliedLengthMm !== null && Math.abs(o.impliedLengthMm / sessionCase(o.k, base).options.cavity!.lengthMm - 1) <= 0.01)
  const twoTem00 = outcomes.filter((o) => o.truthTem00Count >= 2 && o.errorPoints <= 3)
  tables.push(
    [
      `seed base ${base}:`,
      '| TEM00 band | cases | median error (points) | worst (points) | > 3 points, not flagged |',
      '|---|---|---|---|---|',
      ...bandFigures(outcomes).map((f) => `| ${(100 * f.band[0]).toFixed(0)}–${(100 * f.band[1]).toFixed(0)} % | ${f.count} | ${f.medianPoints.toFixed(2)} | ${f.worstPoints.toFixed(2)} | ${f.unflagged.map((o) => o.k).join(', ') || '-'} |`),
      `FSR within 0.1 %: ${twoTem00.filter((o) => o.fsrError <= 0.001).length} of ${twoTem00.length} right readings with two or more TEM00; ${outcomes.filter((o) => o.foundFraction !== null && o.fsrError <= 0.001).length} of ${outcomes.filter((o) => o.foundFraction !== null).length} readings in all.`,
      `Labels on nothing: ${outcomes.reduce((s, o) => s + o.labelsOnNothing, 0)}. Length named within 1 %: ${lengthRight.length} of ${lengthCases.length} length-off cases with transverse orders seen.`,
      `Flagged ambiguous_reading: ${outcomes.filter((o) => o.warnings.includes('ambiguous_reading')).length}, of which right within 3 points: ${outcomes.filter((o) => o.warnings.includes('ambiguous_reading') && o.errorPoints <= 3).length}.`,
    ].join('\n'),
  )
}
console.log(`\n${tables.join('\n\n')}`)
