/** One cavity with a stored trace and an analysis per test server, made straight in the database. */
import { gzipSync } from 'node:zlib'
import { insertAnalysis } from '../../server/analyses/analysisRepository'
import { insertCavity } from '../../server/cavities/cavityRepository'
import { insertTrace } from '../../server/traces/traceRepository'
import type { TestServer } from './testServer'
import { generatedTraceCsv, testCavityGeometry } from './traceFiles'

export interface TuningFixture {
  cavityId: string
  traceId: string
  analysisId: string
  csv: string
}

const made = new WeakMap<TestServer, Promise<TuningFixture>>()

export function tuningFixture(server: TestServer): Promise<TuningFixture> {
  let fixture = made.get(server)
  if (!fixture) {
    fixture = (async () => {
      const csv = generatedTraceCsv({ seed: 11 })
      const cavity = await insertCavity(server.db, { name: `Fixture cavity ${Date.now()}`, description: '', location: '', ...testCavityGeometry, targetFundamentalFraction: 0.8, archived: false })
      const { trace } = await insertTrace(server.db, { cavityId: cavity.id, sha256: 'fixture', fileName: 'fixture.csv', sizeBytes: csv.length, contentGzip: gzipSync(csv), note: 'fixture', uploadedBy: null })
      const analysis = await insertAnalysis(server.db, { traceId: trace.id, cavityId: cavity.id, options: {}, geometry: testCavityGeometry, requestedBy: null })
      return { cavityId: cavity.id, traceId: trace.id, analysisId: analysis.id, csv }
    })()
    made.set(server, fixture)
  }
  return fixture
}
