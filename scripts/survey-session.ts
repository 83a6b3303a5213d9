import { sessionCase, SESSION_CASE_COUNT, SESSION_SEED_BASE } from '../tests/unit/accuracy/sessionCases'
import { evaluateSessionCase, SESSION_TABLE_HEADER } from '../tests/unit/accuracy/evaluateSessionCase'
const base = Number(process.argv[2] ?? SESSION_SEED_BASE)
const count = Number(process.argv[3] ?? SESSION_CASE_COUNT)
console.log(SESSION_TABLE_HEADER.join('\n'))
for (let k = 0; k < count; k++) {
  const t0 = performance.now()
  const o = evaluateSessionCase(k, sessionCase(k, base))
  console.log(o.row, `${(performance.now() - t0).toFixed(0)} ms`)
}
