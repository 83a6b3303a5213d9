/**
 * Vitest global set-up: build dist/server and dist/cli when a source is newer than the last build, so the tests of
 * the command line and of the built server never run stale code.
 */
import { buildCodeIfStale } from '../../scripts/build.mjs'

export default async function setup(): Promise<void> {
  await buildCodeIfStale()
}
