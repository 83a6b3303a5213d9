/**
 * `npm run bench`: runs every benchmark module in scripts/bench/ in name order (or only those named
 * on the command line: `npm run bench -- read analysis`) and prints their figures.
 * Each module default-exports `async () => void` and prints its own table.
 */
import { readdirSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath, pathToFileURL } from 'node:url'

const here = join(dirname(fileURLToPath(import.meta.url)), 'bench')
const wanted = process.argv.slice(2)
const modules = readdirSync(here)
  .filter((name) => name.endsWith('.ts'))
  .filter((name) => wanted.length === 0 || wanted.includes(name.replace(/\.ts$/, '')))
  .sort()

console.log(`Cavitrace benchmarks — node ${process.version}, ${new Date().toISOString()}`)
for (const name of modules) {
  console.log(`\n## ${name.replace(/\.ts$/, '')}`)
  const mod = (await import(pathToFileURL(join(here, name)).href)) as { default: () => Promise<void> }
  await mod.default()
}
