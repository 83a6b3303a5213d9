/** The exports a batch analyses: files as named, and every export directly inside a named folder, by name. */
import { readdirSync, statSync } from 'node:fs'
import { join } from 'node:path'

/** Extensions of the text exports the reader takes. */
export const traceExtensions = /\.(csv|txt|tsv|dat)$/i

/** Editors' and copy tools' temporary or hidden files, never an export. */
export function isTemporaryName(name: string): boolean {
  return name.startsWith('.') || name.startsWith('~') || /\.(tmp|part|partial|crdownload|swp)$/i.test(name) || name.endsWith('~')
}

/** Expand folders (not recursively); a path that does not exist stays in the list, to be reported as refused. */
export function listTraceFiles(paths: string[]): { files: string[]; fromFolder: boolean } {
  const files: string[] = []
  let fromFolder = false
  for (const path of paths) {
    if (!statSync(path, { throwIfNoEntry: false })?.isDirectory()) {
      files.push(path)
      continue
    }
    fromFolder = true
    const names = readdirSync(path)
      .filter((name) => traceExtensions.test(name) && !isTemporaryName(name) && !/\.(truth|cavity)\.json$/.test(name))
      .sort()
    for (const name of names) {
      const file = join(path, name)
      if (statSync(file).isFile()) files.push(file)
    }
  }
  return { files, fromFolder }
}
