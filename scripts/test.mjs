// `npm test`: everything CI runs. Sets up a throwaway PostgreSQL cluster (its own folder and port;
// the development data is never touched), then runs typecheck, lint, unit, API and browser tests,
// prints one summary whose last line is `N passed, N failed`, tears down, and exits non-zero on any failure.
import { spawnSync } from 'node:child_process'
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { join } from 'node:path'
import { buildCodeIfStale } from './build.mjs'
import { LocalPostgres, SetupError, ensureChromium, ensureNodeModules, ensurePostgres, projectRoot, say } from './lib/services.mjs'

const bin = (name) => join(projectRoot, 'node_modules', '.bin', name)
const outputDir = join(projectRoot, 'test-output')
// `npm test -- unit api` runs only those suites; test file paths narrow them further
// (`npm test -- api tests/api/health.test.ts`).
const suiteNames = ['typecheck', 'lint', 'unit', 'api', 'e2e']
const only = process.argv.slice(2).filter((arg) => suiteNames.includes(arg))
const fileFilters = process.argv.slice(2).filter((arg) => !suiteNames.includes(arg))

function freePort(preferred) {
  return new Promise((resolve) => {
    const probe = createServer()
    probe.once('error', () => resolve(freePort(0)))
    probe.listen(preferred, '127.0.0.1', () => {
      const { port } = probe.address()
      probe.close(() => resolve(port))
    })
  })
}

function run(command, args, env) {
  const result = spawnSync(command, args, { cwd: projectRoot, stdio: 'inherit', env })
  return result.status === 0
}

/** Run one vitest project and read its counts from the JSON report. */
function vitestSuite(project, env) {
  const report = join(outputDir, `vitest-${project}.json`)
  rmSync(report, { force: true })
  const ok = run(bin('vitest'), ['run', '--project', project, ...fileFilters, '--passWithNoTests', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`], env)
  if (!existsSync(report)) return { passed: 0, failed: 1, note: 'the runner crashed before reporting' }
  const counts = JSON.parse(readFileSync(report, 'utf8'))
  const failedSuites = (counts.testResults ?? []).filter((file) => file.status === 'failed' && (file.assertionResults ?? []).length === 0).length
  const failed = counts.numFailedTests + failedSuites
  return { passed: counts.numPassedTests, failed: ok || failed > 0 ? failed : 1, note: failedSuites ? `${failedSuites} file(s) failed to load` : '' }
}

async function main() {
  mkdirSync(outputDir, { recursive: true })
  ensureNodeModules()
  const wants = (suite) => only.length === 0 || only.includes(suite)
  const needsDb = wants('api') || wants('e2e')
  const chromium = wants('e2e') ? ensureChromium() : undefined

  let cluster
  const dataDir = join(projectRoot, '.data', `test-${process.pid}`)
  const results = []
  try {
    // The API and browser suites run the built server (dist/server), as production does.
    await buildCodeIfStale({ announce: true })
    const env = { ...process.env, NODE_ENV: 'test', CHROMIUM_PATH: chromium ?? '', CAVITRACE_TEST_OUTPUT: outputDir, CAVITRACE_TEST_SERVER: process.env.CAVITRACE_TEST_SERVER ?? 'built' }
    if (needsDb) {
      const port = await freePort(Number(process.env.CAVITRACE_TEST_DB_PORT ?? 54339))
      say(`starting a throwaway PostgreSQL on 127.0.0.1:${port}…`)
      cluster = new LocalPostgres({ bin: ensurePostgres(), dir: dataDir, port })
      process.env.CAVITRACE_PG_FSYNC = 'off' // throwaway data: no need to survive a power cut
      await cluster.start()
      await cluster.createDatabase('cavitrace_template')
      env.CAVITRACE_TEST_PG = cluster.url('')
      // For the test that a connection without the password is refused.
      env.CAVITRACE_TEST_PG_BIN = cluster.bin
      env.CAVITRACE_TEST_PG_SOCKET = cluster.socketDir
      env.CAVITRACE_TEST_TEMPLATE_DB = 'cavitrace_template'
      const migrated = run(process.execPath, ['dist/server/prepare.js'], { ...env, DATABASE_URL: cluster.url('cavitrace_template') })
      if (!migrated) throw new SetupError('could not migrate the test template database')
    }

    if (wants('typecheck')) {
      say('typecheck (vue-tsc)…')
      const ok = run(bin('vue-tsc'), ['--noEmit', '-p', 'tsconfig.json'], env)
      results.push({ suite: 'typecheck', passed: ok ? 1 : 0, failed: ok ? 0 : 1 })
    }
    if (wants('lint')) {
      say('lint (eslint)…')
      const ok = run(bin('eslint'), ['.'], env)
      results.push({ suite: 'lint', passed: ok ? 1 : 0, failed: ok ? 0 : 1 })
    }
    if (wants('unit')) {
      say('unit tests…')
      results.push({ suite: 'unit', ...vitestSuite('unit', env) })
    }
    if (wants('api')) {
      say('API tests (real server, real PostgreSQL)…')
      results.push({ suite: 'api', ...vitestSuite('api', env) })
    }
    if (wants('e2e')) {
      say('building the client for browser tests…')
      const built = run(bin('vite'), ['build', '--logLevel', 'warn'], env)
      if (built) {
        say('browser tests (Chromium)…')
        results.push({ suite: 'e2e', ...vitestSuite('e2e', { ...env, CLIENT_DIR: join(projectRoot, 'dist', 'client') }) })
      } else {
        results.push({ suite: 'e2e', passed: 0, failed: 1, note: 'client build failed' })
      }
    }
  } finally {
    if (cluster) {
      say('tearing down the test database…')
      try {
        cluster.stop()
      } finally {
        rmSync(dataDir, { recursive: true, force: true })
      }
    }
  }

  const passed = results.reduce((sum, r) => sum + r.passed, 0)
  const failed = results.reduce((sum, r) => sum + r.failed, 0)
  process.stdout.write('\nSummary\n')
  for (const r of results) process.stdout.write(`  ${r.suite.padEnd(10)} ${String(r.passed).padStart(4)} passed, ${r.failed} failed${r.note ? ` (${r.note})` : ''}\n`)
  process.stdout.write(`${passed} passed, ${failed} failed\n`)
  process.exit(failed > 0 || results.length === 0 ? 1 : 0)
}

main().catch((error) => {
  process.stderr.write(`[cavitrace] ${error instanceof SetupError ? error.message : error?.stack ?? error}\n`)
  process.stdout.write('0 passed, 1 failed\n')
  process.exit(1)
})
