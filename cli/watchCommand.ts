/**
 * `cavitrace watch DIR --cavity ID --url URL [--note TEXT] [--settle SECONDS]`, token from CAVITRACE_TOKEN: upload
 * every new export saved into DIR once it is finished, and print its headline when the analysis is done. Runs until
 * interrupted. A file whose content was already sent in this run is not sent again (and the server keeps one trace
 * per content hash anyway, so a retried upload cannot store it twice).
 */
import { createHash } from 'node:crypto'
import { readFileSync, statSync } from 'node:fs'
import { basename } from 'node:path'
import { setTimeout as sleep } from 'node:timers/promises'
import { createFinishedFileTracker } from './finishedFileTracker'
import { headlineText } from './headline'
import { parseCommandLine } from './parseCommandLine'
import { MAX_TRACE_BYTES } from './readInputs'
import { RefusedError, createServerClient } from './serverClient'
import { UsageError } from './usageError'

export const watchHelp = `Usage: cavitrace watch DIR --cavity ID --url URL [--note TEXT] [--settle SECONDS]

Uploads each new export saved into DIR (.csv, .txt, .tsv, .dat; not hidden or temporary files)
once its size has stood still for the settle time (default 1 s), and prints its headline when the
analysis is done. Waits and retries while the server is unreachable. Stop it with Ctrl-C.
The API token is read from the environment variable CAVITRACE_TOKEN.
  --cavity ID      the cavity the exports belong to
  --url URL        the server, e.g. http://127.0.0.1:3000
  --note TEXT      note stored with every upload
`

export async function watchCommand(args: string[]): Promise<number> {
  const parsed = parseCommandLine('watch', args, {
    cavity: { type: 'string' },
    url: { type: 'string' },
    note: { type: 'string' },
    settle: { type: 'string' },
  }, watchHelp)
  if (parsed === null) return 0
  const { values, positionals } = parsed
  if (positionals.length !== 1) throw new UsageError('bad_argument', 'cavitrace watch takes exactly one DIR. (cavitrace watch --help)')
  const folder = positionals[0]
  if (!statSync(folder, { throwIfNoEntry: false })?.isDirectory()) throw new UsageError('file_not_found', `cavitrace watch: ${JSON.stringify(folder)} is not a folder.`)
  if (!values.cavity) throw new UsageError('bad_argument', 'cavitrace watch: --cavity ID is required.')
  if (!values.url || !/^https?:\/\/[^/]/.test(values.url)) throw new UsageError('bad_argument', 'cavitrace watch: --url must be the server address, e.g. http://127.0.0.1:3000.')
  const token = process.env.CAVITRACE_TOKEN
  if (!token) throw new UsageError('no_token', 'cavitrace watch: set CAVITRACE_TOKEN to an API token (created under your user menu in Cavitrace).')
  const settleSeconds = values.settle === undefined ? 1 : Number(values.settle)
  if (!Number.isFinite(settleSeconds) || settleSeconds < 0) throw new UsageError('bad_argument', `cavitrace watch: --settle needs seconds, not ${JSON.stringify(values.settle)}.`)

  const note = (text: string) => process.stderr.write(`cavitrace watch: ${text}\n`)
  const client = createServerClient({ url: values.url, token, note })
  const tracker = createFinishedFileTracker(folder, settleSeconds * 1000)
  const sent = new Map<string, string>() // content hash → the file it was first sent as
  const cavityId = values.cavity
  // No signal handlers: Ctrl-C ends the watcher at once, even while it waits for the server.
  note(`watching ${folder} for new exports (cavity ${cavityId}, ${values.url})`)

  for (;;) {
    for (const file of tracker.poll()) {
      const name = basename(file)
      let bytes: Buffer
      try {
        bytes = readFileSync(file)
      } catch {
        continue // gone again before it could be read
      }
      if (bytes.length > MAX_TRACE_BYTES) {
        process.stdout.write(`${name}: not sent: larger than ${MAX_TRACE_BYTES / 2 ** 20} MiB\n`)
        continue
      }
      const hash = createHash('sha256').update(bytes).digest('hex')
      const first = sent.get(hash)
      if (first !== undefined) {
        process.stdout.write(`${name}: same content as ${first}, already sent\n`)
        continue
      }
      try {
        const upload = await client.upload(cavityId, file, bytes)
        sent.set(hash, name)
        const analysis = await client.finished(upload.analysis)
        const stored = upload.created ? '' : ' (already stored)'
        if (analysis.status === 'done' && analysis.result) process.stdout.write(`${name}: ${headlineText(analysis.result)}${stored}\n`)
        else process.stdout.write(`${name}: analysis failed: ${analysis.error?.message ?? 'no reason given'}${stored}\n`)
      } catch (error) {
        if (!(error instanceof RefusedError)) throw error
        // A wrong token or cavity refuses every file alike: stop and say so; a refused file is only that file's.
        if (error.status === 401 || error.status === 403 || error.status === 404) throw new UsageError(error.code, `cavitrace watch: the server refused: ${error.message}`)
        process.stdout.write(`${name}: refused by the server (${error.status} ${error.code}): ${error.message}\n`)
      }
    }
    await sleep(200)
  }
}
