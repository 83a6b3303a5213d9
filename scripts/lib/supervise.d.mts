// Types for supervise.mjs (plain Node, used by `npm start`).
import type { ChildProcess } from 'node:child_process'
export const EXIT_CONFIG: number
export function supervise(options: {
  start: () => ChildProcess
  isStopping?: () => boolean
  onCrash?: (crash: { exitCode: number | null; signal: NodeJS.Signals | null; givingUp: boolean }) => void
  delayMs?: number
  maxCrashes?: number
  windowMs?: number
}): Promise<number>
