#!/usr/bin/env node
// The `cavitrace` command (package bin). Runs the built tool, dist/cli/cavitrace.cjs, building it first when it is
// missing (a fresh clone). Called as `npm run analyze|inspect|generate`, it also rebuilds when a source is newer:
// npm's own start costs far more than that check, which a direct call (or one from npx) skips to start fast.
//
// The tool is loaded through node:vm with V8's code cache (dist/cli/cavitrace.v8cache, written as a run ends when
// there was none, V8 refused it, or CAVITRACE_CODE_CACHE=refresh; the build writes it after analysing a small
// generated trace): later starts skip compiling the bundle and the functions that run used.
import { existsSync, readFileSync, renameSync, writeFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { dirname } from 'node:path'
import { fileURLToPath } from 'node:url'
import { Script } from 'node:vm'

const file = fileURLToPath(new URL('../dist/cli/cavitrace.cjs', import.meta.url))
const viaNpmRun = ['analyze', 'inspect', 'generate'].includes(process.env.npm_lifecycle_event ?? '')
if (!existsSync(file) || (viaNpmRun && existsSync(new URL('../cli/cavitrace.ts', import.meta.url)))) {
  const { buildCodeIfStale } = await import('../scripts/build.mjs')
  await buildCodeIfStale()
}

const cacheFile = file.replace(/\.cjs$/, '.v8cache')
let cachedData
try {
  cachedData = readFileSync(cacheFile)
} catch {
  cachedData = undefined
}
const source = readFileSync(file, 'utf8')
const script = new Script(`(function (exports, require, module, __filename, __dirname) {${source}\n})`, { filename: file, cachedData })
if (cachedData === undefined || script.cachedDataRejected || process.env.CAVITRACE_CODE_CACHE === 'refresh') {
  process.once('exit', () => {
    try {
      const temporary = `${cacheFile}.${process.pid}`
      writeFileSync(temporary, script.createCachedData())
      renameSync(temporary, cacheFile)
    } catch {
      // A read-only install runs without the cache.
    }
  })
}
const module = { exports: {} }
script.runInThisContext()(module.exports, createRequire(file), module, file, dirname(file))
