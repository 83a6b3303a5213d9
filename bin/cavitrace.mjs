#!/usr/bin/env node
// The `cavitrace` command (package bin). Runs the built tool in dist/cli, building it first when it is missing (a
// fresh clone). Called through `npm run` (analyze, inspect, generate), it also rebuilds when a source is newer:
// npm's own start costs far more than that check, which a direct call skips to start fast.
import { existsSync } from 'node:fs'

const built = new URL('../dist/cli/cavitrace.js', import.meta.url)
const source = new URL('../cli/cavitrace.ts', import.meta.url)
if (!existsSync(built) || (process.env.npm_lifecycle_event && existsSync(source))) {
  const { buildCodeIfStale } = await import('../scripts/build.mjs')
  await buildCodeIfStale()
}
await import(built.href)
