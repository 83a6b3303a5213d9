/** The app's version, read once from package.json (found upwards from this module: sources, or the build in dist/server). */
import { existsSync, readFileSync } from 'node:fs'

function findManifest(): URL {
  for (const relative of ['../package.json', '../../package.json']) {
    const url = new URL(relative, import.meta.url)
    if (existsSync(url)) return url
  }
  throw new Error('package.json not found beside the server')
}

const manifest = JSON.parse(readFileSync(findManifest(), 'utf8')) as { version: string }

export const appVersion: string = manifest.version
