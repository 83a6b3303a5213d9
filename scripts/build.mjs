// `npm run build:code` (also run by `npm start`, `npm test` and npm's prepare step): compile the server, the
// analysis worker and the command-line tool with esbuild into dist/server and dist/cli, only when a source is
// newer than the last build. The Vite client build stays in dist/client; the three folders never overlap.
//
// dist/server: main.js (the app), worker.js (`npm run worker`), server.js (startServer, for the tests),
// prepare.js (migrate + seed), analysisThread.js and planThread.js (worker threads, found beside the
// entry that starts them), migrations/*.js. npm packages stay imports from node_modules.
// dist/cli: cavitrace.cjs and batchThread.cjs, with every package bundled in, so the tool starts from one file.
// CommonJS, because bin/cavitrace.mjs loads it through node:vm with V8's code cache (Node 20's ES module loader
// has none), which spares most of the compiling at every start.
import { spawnSync } from 'node:child_process'
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, relative } from 'node:path'
import { fileURLToPath } from 'node:url'

const projectRoot = join(fileURLToPath(new URL('.', import.meta.url)), '..')
const sourceFolders = ['server', 'shared', 'db', 'cli']
const sourceFiles = ['package.json', 'package-lock.json', 'scripts/build.mjs', 'scripts/prepare.ts']
const stampFile = join(projectRoot, 'dist', '.code-build.json')

/** Newest modification time and count of the files the build reads (a deleted file changes the count). */
function sourceState() {
  let newestMs = 0
  let count = 0
  const visit = (path) => {
    const stats = statSync(path)
    if (stats.isDirectory()) {
      for (const name of readdirSync(path)) visit(join(path, name))
    } else if (/\.(ts|json|mjs)$/.test(path) && !path.endsWith('.test.ts')) {
      newestMs = Math.max(newestMs, stats.mtimeMs)
      count++
    }
  }
  for (const folder of sourceFolders) if (existsSync(join(projectRoot, folder))) visit(join(projectRoot, folder))
  for (const file of sourceFiles) visit(join(projectRoot, file))
  return { newestMs, count }
}

/** True when dist/server and dist/cli are missing or older than a source. */
export function codeBuildIsStale() {
  if (!existsSync(stampFile)) return true
  const stamp = JSON.parse(readFileSync(stampFile, 'utf8'))
  const state = sourceState()
  return stamp.newestMs !== state.newestMs || stamp.count !== state.count
}

const common = {
  absWorkingDir: projectRoot,
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'esm',
  sourcemap: 'linked',
  logLevel: 'warning',
  legalComments: 'none',
}

// The command line is built as CommonJS: import.meta.url becomes the file's own URL.
const fileUrlShim = "const __cavitraceFileUrl = require('node:url').pathToFileURL(__filename).href;"

// zod's namespace object re-exports every locale (750 kB of the tool's 1.1 MB); the engine only uses the default
// English messages, so the tool's bundle gets a locale index holding English alone. Halves its start-up.
const englishOnlyZodLocales = {
  name: 'english-only-zod-locales',
  setup(build) {
    build.onResolve({ filter: /^\.\.\/locales\/index\.js$/ }, (args) => (args.importer.includes(`${join('node_modules', 'zod')}`) ? { path: 'zod-locales', namespace: 'english-only' } : undefined))
    build.onLoad({ filter: /.*/, namespace: 'english-only' }, () => ({
      contents: "export { default as en } from 'zod/v4/locales/en.js'",
      resolveDir: projectRoot,
    }))
  },
}

/** Build dist/server and dist/cli. */
export async function buildCode() {
  const { build } = await import('esbuild')
  const state = sourceState()
  rmSync(join(projectRoot, 'dist', 'server'), { recursive: true, force: true })
  rmSync(join(projectRoot, 'dist', 'cli'), { recursive: true, force: true })
  const migrations = readdirSync(join(projectRoot, 'db', 'migrations')).filter((name) => name.endsWith('.ts'))
  await Promise.all([
    build({
      ...common,
      packages: 'external',
      entryPoints: {
        main: 'server/main.ts',
        worker: 'server/worker.ts',
        server: 'server/server.ts',
        prepare: 'scripts/prepare.ts',
        analysisThread: 'server/jobs/analysisThread.ts',
        planThread: 'server/plans/planThread.ts',
      },
      outdir: 'dist/server',
    }),
    build({
      ...common,
      packages: 'external',
      entryPoints: migrations.map((name) => ({ in: join('db', 'migrations', name), out: name.replace(/\.ts$/, '') })),
      outdir: 'dist/server/migrations',
    }),
    build({
      ...common,
      entryPoints: { cavitrace: 'cli/cavitrace.ts', batchThread: 'cli/batchThread.ts' },
      outdir: 'dist/cli',
      format: 'cjs',
      outExtension: { '.js': '.cjs' },
      banner: { js: fileUrlShim },
      define: { 'import.meta.url': '__cavitraceFileUrl' },
      minify: true,
      plugins: [englishOnlyZodLocales],
    }),
  ])
  mkdirSync(join(projectRoot, 'dist'), { recursive: true })
  writeFileSync(stampFile, JSON.stringify(state) + '\n')
  warmCodeCache()
}

/** Write the command line's V8 code cache from one analysis of a small generated trace (see bin/cavitrace.mjs). */
function warmCodeCache() {
  const folder = mkdtempSync(join(tmpdir(), 'cavitrace-build-'))
  try {
    const cli = join(projectRoot, 'bin', 'cavitrace.mjs')
    const trace = join(folder, 'warm.csv')
    const env = { ...process.env, npm_lifecycle_event: 'build' }
    spawnSync(process.execPath, [cli, 'generate', '--preset', 'reference-1064', '--samples', '20000', '--out', trace], { env, stdio: 'ignore' })
    spawnSync(process.execPath, [cli, 'analyze', trace, '--cavity', join(folder, 'warm.cavity.json')], { env: { ...env, CAVITRACE_CODE_CACHE: 'refresh' }, stdio: 'ignore' })
  } finally {
    rmSync(folder, { recursive: true, force: true })
  }
}

/** Build when stale; says what it did on stdout when `announce` is set. Returns true when it built. */
export async function buildCodeIfStale({ announce = false } = {}) {
  if (!codeBuildIsStale()) return false
  const started = performance.now()
  await buildCode()
  if (announce) process.stdout.write(`[cavitrace] built dist/server and dist/cli in ${Math.round(performance.now() - started)} ms\n`)
  return true
}

if (process.argv[1] && relative(process.argv[1], fileURLToPath(import.meta.url)) === '') {
  const force = process.argv.includes('--force')
  if (force) await buildCode()
  else await buildCodeIfStale()
}
