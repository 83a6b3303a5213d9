/**
 * `npx tsx scripts/survey-accuracy.ts [SEED_BASE …]`: the accuracy suite's 60 cases (tests/unit/accuracy) run again
 * with other noise draws — case k gets seed SEED_BASE + k (the suite itself uses 100 + k). Prints one line per case
 * with what missed the suite's criteria, then per seed set the median and worst TEM00-fraction error on the cases
 * with at least 5 samples per linewidth. Not part of `npm test`: one seed set takes about two minutes.
 */
import { accuracyCase, CASE_COUNT } from '../tests/unit/accuracy/accuracyCases'
import { CRITERIA, evaluateCase } from '../tests/unit/accuracy/evaluateCase'

const bases = process.argv.slice(2).map(Number)
if (bases.length === 0) bases.push(5000, 9000, 13000)
if (bases.some((b) => !Number.isInteger(b) || b < 0)) {
  console.error('Seed bases must be non-negative integers, e.g. `npx tsx scripts/survey-accuracy.ts 5000 9000`.')
  process.exit(2)
}

const summary: string[] = []
for (const base of bases) {
  const errors: number[] = []
  for (let k = 0; k < CASE_COUNT; k++) {
    const outcome = evaluateCase(k, { ...accuracyCase(k), seed: base + k })
    if (outcome.samplesPerLinewidth >= CRITERIA.wellSampled) errors.push(Number.isFinite(outcome.fractionErrorPoints) ? outcome.fractionErrorPoints : Infinity)
    const missed = outcome.failures.length ? outcome.failures.join('; ') : '-'
    console.log(`seed ${base + k}\tcase ${k}\t${outcome.samplesPerLinewidth.toFixed(1)} samples/linewidth\terror ${outcome.fractionErrorPoints.toFixed(2)} points\t${missed}`)
  }
  errors.sort((a, b) => a - b)
  summary.push(`seeds ${base}+k: ${errors.length} well-sampled cases, median ${errors[errors.length >> 1].toFixed(2)} points, worst ${errors[errors.length - 1].toFixed(2)} points`)
}
console.log(`\n${summary.join('\n')}`)
