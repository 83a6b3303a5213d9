/**
 * Which exports in a folder are new and finished: looked at on every poll (a listing and one stat per export, which
 * also works on network shares where change events are unreliable). A file counts as finished once its size and
 * modification time have stood still for the settle time; temporary and hidden files are never taken. Files already
 * there when watching starts are left alone unless their content changes later.
 */
import { readdirSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { isTemporaryName, traceExtensions } from './listTraceFiles'

interface Seen {
  size: number
  mtimeMs: number
  /** When size and mtime were last seen to change. */
  changedAt: number
  /** Size and mtime as last handed out (or as found at start); the file is handed out again only after a change. */
  takenSize: number
  takenMtimeMs: number
}

export interface FinishedFileTracker {
  /** The files that finished since the last call, by name. */
  poll(now?: number): string[]
}

export function createFinishedFileTracker(folder: string, settleMs: number): FinishedFileTracker {
  const seen = new Map<string, Seen>()
  const look = (now: number, initial: boolean): string[] => {
    const finished: string[] = []
    let names: string[]
    try {
      names = readdirSync(folder).filter((name) => traceExtensions.test(name) && !isTemporaryName(name))
    } catch {
      return finished // the folder is gone for a moment (a share reconnecting): try again next time
    }
    for (const name of names.sort()) {
      let size: number
      let mtimeMs: number
      try {
        const stats = statSync(join(folder, name))
        if (!stats.isFile()) continue
        ;({ size, mtimeMs } = stats)
      } catch {
        continue // renamed or deleted between the listing and the stat
      }
      const entry = seen.get(name)
      if (!entry) {
        seen.set(name, { size, mtimeMs, changedAt: now, takenSize: initial ? size : -1, takenMtimeMs: initial ? mtimeMs : -1 })
        continue
      }
      if (entry.size !== size || entry.mtimeMs !== mtimeMs) {
        entry.size = size
        entry.mtimeMs = mtimeMs
        entry.changedAt = now
        continue
      }
      const settled = now - entry.changedAt >= settleMs
      const alreadyTaken = entry.takenSize === size && entry.takenMtimeMs === mtimeMs
      if (settled && !alreadyTaken && size > 0) {
        entry.takenSize = size
        entry.takenMtimeMs = mtimeMs
        finished.push(join(folder, name))
      }
    }
    return finished
  }
  look(Date.now(), true)
  return { poll: (now = Date.now()) => look(now, false) }
}
