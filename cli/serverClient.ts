/**
 * The watcher's side of the HTTP API: upload one export to a cavity and wait for its analysis. Every call retries
 * with back-off while the server cannot be reached or answers 5xx/429 (a restart, an update), and says so on stderr;
 * a refusal (4xx) is final. A retried upload cannot store the file twice: the server keeps one trace per content hash.
 */
import { basename } from 'node:path'
import { setTimeout as sleep } from 'node:timers/promises'
import type { AnalysisRecord, UploadOutcome } from '../shared/api/tuningTypes'

export class RefusedError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
  ) {
    super(message)
  }
}

export interface ServerClientOptions {
  url: string
  token: string
  /** First wait after a failure; doubled up to maxBackoffMs. */
  backoffMs?: number
  maxBackoffMs?: number
  note?: (text: string) => void
}

export function createServerClient(options: ServerClientOptions) {
  const base = options.url.replace(/\/+$/, '')
  const { backoffMs = 250, maxBackoffMs = 8000, note = () => {} } = options
  const headers = { Authorization: `Bearer ${options.token}` }

  /** One request, repeated with back-off until the server answers something other than 5xx/429. */
  async function call(what: string, send: () => Promise<Response>): Promise<unknown> {
    let wait = backoffMs
    for (let attempt = 1; ; attempt++) {
      let reason: string
      try {
        const response = await send()
        const body = (await response.json().catch(() => null)) as { error?: { code: string; message: string } } | null
        if (response.ok) return body
        if (response.status < 500 && response.status !== 429) {
          throw new RefusedError(response.status, body?.error?.code ?? `http_${response.status}`, body?.error?.message ?? `${what}: HTTP ${response.status}`)
        }
        reason = `HTTP ${response.status}`
      } catch (error) {
        if (error instanceof RefusedError) throw error
        const cause = (error as { cause?: { code?: string } }).cause?.code
        reason = cause ?? (error as Error).message
      }
      note(`${what}: ${reason}; trying again in ${(wait / 1000).toFixed(1)} s (attempt ${attempt})`)
      await sleep(wait)
      wait = Math.min(maxBackoffMs, wait * 2)
    }
  }

  return {
    async upload(cavityId: string, file: string, bytes: Buffer): Promise<UploadOutcome> {
      const body = (await call(`uploading ${basename(file)}`, () => {
        const form = new FormData()
        form.append('file', new Blob([new Uint8Array(bytes)]), basename(file))
        return fetch(`${base}/api/cavities/${encodeURIComponent(cavityId)}/traces`, { method: 'POST', headers, body: form })
      })) as { uploads: UploadOutcome[] }
      return body.uploads[0]
    },

    /** Poll the analysis until it is done or failed. */
    async finished(analysis: AnalysisRecord, pollMs = 250): Promise<AnalysisRecord> {
      let current = analysis
      while (current.status === 'queued' || current.status === 'running') {
        await sleep(pollMs)
        current = (await call(`waiting for analysis ${analysis.id}`, () => fetch(`${base}/api/analyses/${analysis.id}`, { headers }))) as AnalysisRecord
      }
      return current
    },
  }
}
