/**
 * Every protected API route, with the action it needs and how to call it successfully — the list
 * tests/api/permissions.test.ts walks. Add a line here when you add a protected route.
 */
import type { Action, Role } from '../../../shared/auth/permissions'
import type { AnalysisResult } from '../../../shared/analysis/types'
import { gzipSync } from 'node:zlib'
import { finishAnalysis, insertAnalysis } from '../../../server/analyses/analysisRepository'
import { insertCavity } from '../../../server/cavities/cavityRepository'
import { softDeleteTrace } from '../../../server/corrections/correctionRepository'
import { insertTrace } from '../../../server/traces/traceRepository'
import { insertLens } from '../../../server/lenses/lensRepository'
import { insertEntry } from '../../../server/logbook/logbookRepository'
import { savePlan } from '../../../server/plans/planService'
import { newApiToken } from '../../../server/tokens/secretTokens'
import { insertToken } from '../../../server/tokens/tokensData'
import type { TestServer } from '../../support/testServer'
import { tuningFixture } from '../../support/tuningFixtures'
import { testCavityGeometry } from '../../support/traceFiles'
import { createPerson, testPassword, uniqueEmail } from './accountsTestKit'

let walkLensCounter = 0
/** A lens of the kit made straight in the database (unique label per call). */
async function walkLens(server: TestServer, focalLengthMm = 150): Promise<string> {
  walkLensCounter += 1
  return (await insertLens(server.db, { label: `walk-${process.pid}-${walkLensCounter}`, focalLengthMm, count: 1, type: 'plano-convex', wavelengthMinNm: null, wavelengthMaxNm: null, notes: '' })).id
}

/** A small, quick planner request for the fixture cavity (coarse 5 mm grid). */
const walkPlanInputs = {
  beam: { kind: 'waist' as const, x: { waistRadiusMm: 0.3, waistPositionMm: 0 } },
  table: { laserToCavityMm: 500, lensZonesMm: [[50, 200], [250, 400]] as [number, number][], minSpacingMm: 10, positionStepMm: 5 },
}

/** A saved plan of the fixture cavity authored by the caller, made through the domain function. */
async function walkPlan(server: TestServer, caller: WalkContext['caller']): Promise<string> {
  const { cavityId } = await tuningFixture(server)
  const inputs = { ...walkPlanInputs, couplingTarget: 0.95, rankBy: 'robust' as const, toleranceMm: 1, table: { ...walkPlanInputs.table } }
  const plan = await savePlan(server.db, cavityId, { inputs, lenses: [{ lensId: await walkLens(server), zMm: 120 }], note: 'walk' }, { ...caller, name: 'walk', via: 'session' })
  return plan.id
}

/** A finished analysis of the fixture cavity with a constructed result (orders only). */
async function walkDoneAnalysis(server: TestServer): Promise<string> {
  const { cavityId, traceId } = await tuningFixture(server)
  const analysis = await insertAnalysis(server.db, { traceId, cavityId, options: {}, geometry: testCavityGeometry, requestedBy: null })
  const result = { fundamentalFraction: 0.9, finesse: 400, linewidthHz: 4e6, orders: { '0': 0.9, '1': 0.05, '2': 0.05 } } as unknown as AnalysisResult
  await finishAnalysis(server.db, analysis.id, { result, engineMs: 1 })
  return analysis.id
}

/** A trace of the fixture cavity uploaded by the caller, with a finished analysis (for the undo routes). */
async function ownTrace(server: TestServer, callerId: number): Promise<{ traceId: string; analysisId: string }> {
  const fixture = await tuningFixture(server)
  const { trace } = await insertTrace(server.db, { cavityId: fixture.cavityId, sha256: `own-${callerId}-${Math.random()}`, fileName: 'own.csv', sizeBytes: fixture.csv.length, contentGzip: gzipSync(fixture.csv), note: '', uploadedBy: callerId })
  const analysis = await insertAnalysis(server.db, { traceId: trace.id, cavityId: fixture.cavityId, options: {}, geometry: testCavityGeometry, requestedBy: callerId })
  const result = { fundamentalFraction: 0.9, fundamentalFractionError: 0.01, finesse: 400, linewidthHz: 4e6, orders: { '0': 0.9, '1': 0.1 }, warnings: [], peaks: [], fsr: { hz: 1.5e9, seconds: 0.01 }, sweep: { startTime: 0, endTime: 0.05 }, gouy: { predictedOneWayRad: 0.4636, measuredOneWayRad: 0.4636 } } as unknown as AnalysisResult
  await finishAnalysis(server.db, analysis.id, { result, engineMs: 1 })
  return { traceId: trace.id, analysisId: analysis.id }
}

/** A second cavity to move traces to. */
const moveTargets = new WeakMap<TestServer, Promise<string>>()
function moveTarget(server: TestServer): Promise<string> {
  let made = moveTargets.get(server)
  if (!made) {
    made = insertCavity(server.db, { name: `Walk move target ${Date.now()}`, description: '', location: '', ...testCavityGeometry, lengthMm: 120, targetFundamentalFraction: null, archived: false }).then((cavity) => cavity.id)
    moveTargets.set(server, made)
  }
  return made
}

/** A trace deleted by someone, for the admin's restore. */
async function deletedTrace(server: TestServer, callerId: number): Promise<string> {
  const { traceId } = await ownTrace(server, callerId)
  await softDeleteTrace(server.db, traceId, { by: callerId, reason: 'walk' })
  return traceId
}

/** A cavity proposed by the caller, waiting for approval. */
async function proposal(server: TestServer, callerId: number): Promise<string> {
  walkLensCounter += 1
  return (await insertCavity(server.db, { name: `Walk proposal ${process.pid}-${walkLensCounter}`, description: '', location: '', ...testCavityGeometry, targetFundamentalFraction: null, archived: false }, { proposedBy: callerId })).id
}

/** What a case may use to build its request. */
export interface WalkContext {
  server: TestServer
  /** The person making the request (one per role). */
  caller: { id: number; role: Role; email: string }
}

export interface ProtectedRouteCase {
  method: 'get' | 'post' | 'patch' | 'put' | 'delete'
  /** Pattern as documented, e.g. `/api/users/:id`. */
  route: string
  /** The action from shared/auth/permissions.ts, or `signedIn` for any signed-in person. */
  action: Action | 'signedIn'
  /** Status of a permitted call. */
  okStatus: number
  /** Build a fresh, valid request for the caller (called for every role, so make unique data). */
  request(context: WalkContext): Promise<{ path: string; body?: unknown; attach?: { field: string; content: Buffer; fileName: string } }>
}

const at = (path: string, body?: unknown) => async () => ({ path, body })

/** A log entry on the fixture cavity written by the caller (authors may change their own entries). */
async function ownLogEntry(server: TestServer, authorId: number): Promise<string> {
  return insertEntry(server.db, { cavityId: (await tuningFixture(server)).cavityId, occurredAt: new Date(), authorId, kind: 'inspection', text: 'walk entry' })
}

/** A finished analysis on the fixture trace (written straight in the database), for the comparison. */
const doneAnalyses = new WeakMap<TestServer, Promise<string>>()
function doneAnalysis(server: TestServer): Promise<string> {
  let made = doneAnalyses.get(server)
  if (!made) {
    made = (async () => {
      const fixture = await tuningFixture(server)
      const result = { fundamentalFraction: 0.8, finesse: 400, linewidthHz: 3.7e6, fsr: { hz: 1.5e9, seconds: 1e-2 }, misalignmentShare: 0.1, mismatchShare: 0.1, orders: { '0': 0.8, '1': 0.1, '2': 0.1 } }
      const [row] = (await server.db('analyses')
        .insert({ trace_id: fixture.traceId, cavity_id: fixture.cavityId, status: 'done', geometry: JSON.stringify(testCavityGeometry), result: JSON.stringify(result), fundamental_fraction: 0.8, finesse: 400, linewidth_hz: 3.7e6 })
        .returning('id')) as Array<{ id: string }>
      return row.id
    })()
    doneAnalyses.set(server, made)
  }
  return made
}

export const protectedRoutes: ProtectedRouteCase[] = [
  { method: 'get', route: '/api/auth/me', action: 'signedIn', okStatus: 200, request: at('/api/auth/me') },
  // Each role's caller changes its password once in the walk (its own session goes on with a fresh cookie).
  { method: 'post', route: '/api/auth/password', action: 'signedIn', okStatus: 200, request: at('/api/auth/password', { currentPassword: testPassword, newPassword: 'a walked new passphrase' }) },
  { method: 'get', route: '/api/users', action: 'users.manage', okStatus: 200, request: at('/api/users') },
  {
    method: 'patch',
    route: '/api/users/:id',
    action: 'users.manage',
    okStatus: 200,
    async request({ server }) {
      const person = await createPerson(server, 'viewer')
      return { path: `/api/users/${person.id}`, body: { name: 'Renamed By Walk' } }
    },
  },
  { method: 'get', route: '/api/invitations', action: 'users.manage', okStatus: 200, request: at('/api/invitations') },
  { method: 'post', route: '/api/invitations', action: 'users.manage', okStatus: 201, request: async () => ({ path: '/api/invitations', body: { email: uniqueEmail('walk'), role: 'viewer' } }) },
  { method: 'get', route: '/api/tokens', action: 'tokens.manageOwn', okStatus: 200, request: at('/api/tokens') },
  { method: 'post', route: '/api/tokens', action: 'tokens.manageOwn', okStatus: 201, request: at('/api/tokens', { name: 'walk token' }) },
  {
    method: 'delete',
    route: '/api/tokens/:id',
    action: 'tokens.manageOwn',
    okStatus: 200,
    async request({ server, caller }) {
      const fresh = newApiToken()
      const token = await insertToken(server.db, { userId: caller.id, name: 'to revoke', prefix: fresh.prefix, hash: fresh.hash })
      return { path: `/api/tokens/${token.id}` }
    },
  },
  { method: 'get', route: '/api/tokens?all=1', action: 'tokens.manageAll', okStatus: 200, request: at('/api/tokens?all=1') },
  {
    method: 'delete',
    route: '/api/users/:id/tokens',
    action: 'tokens.manageAll',
    okStatus: 200,
    async request({ server }) {
      const person = await createPerson(server, 'viewer')
      return { path: `/api/users/${person.id}/tokens` }
    },
  },
  { method: 'get', route: '/api/audit', action: 'audit.read', okStatus: 200, request: at('/api/audit') },
  { method: 'get', route: '/api/outbox', action: 'outbox.read', okStatus: 200, request: at('/api/outbox') },
  // The tuning loop (issue 6). GET /api/cavities/:id/events is a never-ending stream, so it is checked in tuningLoop.test.ts instead.
  { method: 'get', route: '/api/cavities', action: 'lab.read', okStatus: 200, request: at('/api/cavities') },
  { method: 'post', route: '/api/cavities', action: 'cavities.write', okStatus: 201, request: async () => ({ path: '/api/cavities', body: { name: `Walk cavity ${uniqueEmail('c')}`, ...testCavityGeometry } }) },
  { method: 'get', route: '/api/cavities/:id', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}` }) },
  { method: 'patch', route: '/api/cavities/:id', action: 'cavities.write', okStatus: 200, request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}`, body: { location: 'Walked table' } }) },
  { method: 'get', route: '/api/cavities/:id/history', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}/history` }) },
  {
    method: 'post',
    route: '/api/cavities/:id/traces',
    action: 'traces.upload',
    okStatus: 202,
    async request({ server, caller }) {
      const fixture = await tuningFixture(server)
      return { path: `/api/cavities/${fixture.cavityId}/traces`, attach: { field: 'file', content: Buffer.from(`${fixture.csv}\n# ${caller.role}\n`), fileName: `${caller.role}.csv` } }
    },
  },
  { method: 'get', route: '/api/traces/:id', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/traces/${(await tuningFixture(server)).traceId}` }) },
  { method: 'get', route: '/api/traces/:id/file', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/traces/${(await tuningFixture(server)).traceId}/file` }) },
  { method: 'post', route: '/api/traces/:id/analyses', action: 'analyses.run', okStatus: 202, request: async ({ server }) => ({ path: `/api/traces/${(await tuningFixture(server)).traceId}/analyses`, body: { peakModel: 'auto' } }) },
  { method: 'get', route: '/api/analyses/:id', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/analyses/${(await tuningFixture(server)).analysisId}` }) },
  // History, overview, maintenance log and alerts (issue 7).
  { method: 'get', route: '/api/cavities/:id/history.csv', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}/history.csv` }) },
  { method: 'get', route: '/api/analyses/compare', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/analyses/compare?a=${await doneAnalysis(server)}&b=${await doneAnalysis(server)}` }) },
  { method: 'get', route: '/api/overview', action: 'lab.read', okStatus: 200, request: at('/api/overview') },
  { method: 'get', route: '/api/overview.csv', action: 'lab.read', okStatus: 200, request: at('/api/overview.csv') },
  { method: 'get', route: '/api/log-kinds', action: 'lab.read', okStatus: 200, request: at('/api/log-kinds') },
  { method: 'post', route: '/api/log-kinds', action: 'cavities.write', okStatus: 201, request: async ({ caller }) => ({ path: '/api/log-kinds', body: { label: `Walk kind ${uniqueEmail(caller.role)}` } }) },
  { method: 'get', route: '/api/cavities/:id/log-entries', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}/log-entries?q=walk` }) },
  { method: 'get', route: '/api/log-entries', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/log-entries?q=walk&cavityId=${(await tuningFixture(server)).cavityId}` }) },
  {
    method: 'post',
    route: '/api/cavities/:id/log-entries',
    action: 'logbook.write',
    okStatus: 201,
    request: async ({ server, caller }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}/log-entries`, body: { kind: 'cleaning', text: `walked by ${caller.role}` } }),
  },
  { method: 'get', route: '/api/log-entries/:id', action: 'lab.read', okStatus: 200, request: async ({ server, caller }) => ({ path: `/api/log-entries/${await ownLogEntry(server, caller.id)}` }) },
  { method: 'patch', route: '/api/log-entries/:id', action: 'logbook.write', okStatus: 200, request: async ({ server, caller }) => ({ path: `/api/log-entries/${await ownLogEntry(server, caller.id)}`, body: { text: 'edited by the walk' } }) },
  { method: 'delete', route: '/api/log-entries/:id', action: 'logbook.write', okStatus: 204, request: async ({ server, caller }) => ({ path: `/api/log-entries/${await ownLogEntry(server, caller.id)}` }) },
  {
    method: 'post',
    route: '/api/log-entries/:id/traces',
    action: 'logbook.write',
    okStatus: 202,
    async request({ server, caller }) {
      const fixture = await tuningFixture(server)
      return { path: `/api/log-entries/${await ownLogEntry(server, caller.id)}/traces`, attach: { field: 'file', content: Buffer.from(`${fixture.csv}\n# log entry by ${caller.role}\n`), fileName: `entry-${caller.role}.csv` } }
    },
  },
  { method: 'get', route: '/api/cavities/:id/alerts', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}/alerts` }) },
  {
    method: 'put',
    route: '/api/cavities/:id/alerts',
    action: 'targets.write',
    okStatus: 200,
    request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}/alerts`, body: { targetFundamentalFraction: 0.8, finesseDropPercent: 15 } }),
  },
  { method: 'put', route: '/api/cavities/:id/watch', action: 'signedIn', okStatus: 200, request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}/watch` }) },
  { method: 'delete', route: '/api/cavities/:id/watch', action: 'signedIn', okStatus: 200, request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}/watch` }) },
  { method: 'get', route: '/api/notifications', action: 'signedIn', okStatus: 200, request: at('/api/notifications') },
  {
    method: 'post',
    route: '/api/notifications/:id/read',
    action: 'signedIn',
    okStatus: 200,
    async request({ server, caller }) {
      const [row] = (await server.db('notifications').insert({ user_id: caller.id, kind: 'fraction_below_target', title: 'walk notification' }).returning('id')) as Array<{ id: string }>
      return { path: `/api/notifications/${row.id}/read` }
    },
  },
  { method: 'post', route: '/api/notifications/read-all', action: 'signedIn', okStatus: 200, request: at('/api/notifications/read-all') },
  // The lens kit and the mode-matching planner (issue 8).
  { method: 'get', route: '/api/lenses', action: 'lab.read', okStatus: 200, request: at('/api/lenses') },
  { method: 'get', route: '/api/lenses.csv', action: 'lab.read', okStatus: 200, request: at('/api/lenses.csv') },
  { method: 'post', route: '/api/lenses', action: 'lenses.write', okStatus: 201, request: async () => ({ path: '/api/lenses', body: { label: `walk-new-${uniqueEmail('l')}`.slice(0, 40), focalLengthMm: 75 } }) },
  {
    method: 'post',
    route: '/api/lenses/import',
    action: 'lenses.write',
    okStatus: 200,
    request: async ({ caller }) => ({ path: '/api/lenses/import', attach: { field: 'file', content: Buffer.from(`label,focal_length_mm,count\nwalk-csv-${caller.role},250,2\n`), fileName: 'kit.csv' } }),
  },
  { method: 'patch', route: '/api/lenses/:id', action: 'lenses.write', okStatus: 200, request: async ({ server }) => ({ path: `/api/lenses/${await walkLens(server)}`, body: { count: 2 } }) },
  { method: 'delete', route: '/api/lenses/:id', action: 'lenses.write', okStatus: 204, request: async ({ server }) => ({ path: `/api/lenses/${await walkLens(server)}` }) },
  {
    method: 'post',
    route: '/api/cavities/:id/plan',
    action: 'lab.read',
    okStatus: 200,
    async request({ server }) {
      const lensIds = [await walkLens(server, 100), await walkLens(server, 200)]
      return { path: `/api/cavities/${(await tuningFixture(server)).cavityId}/plan`, body: { ...walkPlanInputs, lensIds } }
    },
  },
  { method: 'get', route: '/api/cavities/:id/plans', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}/plans` }) },
  {
    method: 'post',
    route: '/api/cavities/:id/plans',
    action: 'plans.write',
    okStatus: 201,
    request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}/plans`, body: { inputs: walkPlanInputs, lenses: [{ lensId: await walkLens(server), zMm: 120 }], note: 'walk' } }),
  },
  { method: 'get', route: '/api/plans/:id', action: 'lab.read', okStatus: 200, request: async ({ server, caller }) => ({ path: `/api/plans/${await walkPlan(server, caller)}` }) },
  { method: 'delete', route: '/api/plans/:id', action: 'plans.write', okStatus: 204, request: async ({ server, caller }) => ({ path: `/api/plans/${await walkPlan(server, caller)}` }) },
  { method: 'get', route: '/api/analyses/:id/mismatch-family', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/analyses/${await walkDoneAnalysis(server)}/mismatch-family` }) },
  // Undoing a wrong upload (issue 13): each caller corrects a trace of their own (a lead or admin may correct anyone's).
  { method: 'delete', route: '/api/traces/:id', action: 'uploads.correct', okStatus: 200, request: async ({ server, caller }) => ({ path: `/api/traces/${(await ownTrace(server, caller.id)).traceId}`, body: { reason: 'walk' } }) },
  {
    method: 'post',
    route: '/api/traces/:id/move',
    action: 'uploads.correct',
    okStatus: 202,
    request: async ({ server, caller }) => ({ path: `/api/traces/${(await ownTrace(server, caller.id)).traceId}/move`, body: { cavityId: await moveTarget(server) } }),
  },
  { method: 'put', route: '/api/analyses/:id/exclusion', action: 'uploads.correct', okStatus: 200, request: async ({ server, caller }) => ({ path: `/api/analyses/${(await ownTrace(server, caller.id)).analysisId}/exclusion`, body: { reason: 'walked out' } }) },
  { method: 'delete', route: '/api/analyses/:id/exclusion', action: 'uploads.correct', okStatus: 200, request: async ({ server, caller }) => ({ path: `/api/analyses/${(await ownTrace(server, caller.id)).analysisId}/exclusion` }) },
  { method: 'get', route: '/api/deleted-traces', action: 'uploads.restore', okStatus: 200, request: at('/api/deleted-traces') },
  { method: 'post', route: '/api/traces/:id/restore', action: 'uploads.restore', okStatus: 200, request: async ({ server, caller }) => ({ path: `/api/traces/${await deletedTrace(server, caller.id)}/restore` }) },
  // Cavity proposals (issue 13): experimenters propose, leads and admins approve or turn down.
  { method: 'get', route: '/api/cavity-proposals', action: 'lab.read', okStatus: 200, request: at('/api/cavity-proposals') },
  { method: 'post', route: '/api/cavity-proposals', action: 'cavities.propose', okStatus: 201, request: async () => ({ path: '/api/cavity-proposals', body: { name: `Walk proposed ${uniqueEmail('p')}`, ...testCavityGeometry } }) },
  { method: 'post', route: '/api/cavities/:id/approve', action: 'cavities.write', okStatus: 200, request: async ({ server, caller }) => ({ path: `/api/cavities/${await proposal(server, caller.id)}/approve` }) },
  { method: 'delete', route: '/api/cavity-proposals/:id', action: 'cavities.write', okStatus: 204, request: async ({ server, caller }) => ({ path: `/api/cavity-proposals/${await proposal(server, caller.id)}` }) },
  { method: 'get', route: '/api/analyses/:id/fit-check', action: 'lab.read', okStatus: 200, request: async ({ server, caller }) => ({ path: `/api/analyses/${(await ownTrace(server, caller.id)).analysisId}/fit-check` }) },
]
