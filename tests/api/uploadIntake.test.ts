/**
 * Issue 17, items 3, 5 and 6: uploads are streamed and checked at the door. gzip-compressed exports are accepted,
 * empty and binary files are refused with a sentence and nothing stored, sizes are refused early, a cut-off body
 * is a 400, and file names are UTF-8 in (plain and RFC 8187 `filename*`) and out (RFC 6266 `filename*`).
 */
import { createHash } from 'node:crypto'
import { request as httpRequest } from 'node:http'
import { gzipSync } from 'node:zlib'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createActor, type TestActor } from '../support/actors'
import { filePart, rawRequest } from '../support/rawHttp'
import { generatedTraceCsv, testCavityGeometry } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

const boundary = 'cavitrace-test-boundary'

async function traceCount(server: TestServer): Promise<number> {
  const rows = await server.db('traces').count<{ count: string }[]>('* as count')
  return Number(rows[0].count)
}

async function setup(env: Record<string, string> = {}) {
  const server = await startTestServer(env)
  const experimenter = await createActor(server.db, 'experimenter')
  const lead = await createActor(server.db, 'lead')
  const created = await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name: 'Intake cavity', ...testCavityGeometry })
  return { server, experimenter, cavityId: created.body.cavity.id as string }
}

/** Post a multipart body written by hand. */
function postRaw(server: TestServer, actor: TestActor, cavityId: string, body: Buffer) {
  return rawRequest(
    server.url,
    [`POST /api/cavities/${cavityId}/traces HTTP/1.1`, `Host: ${new URL(server.url).host}`, `Authorization: ${actor.authorization}`, `Content-Type: multipart/form-data; boundary=${boundary}`, `Content-Length: ${body.length}`].join('\r\n'),
    body,
  )
}

describe('upload intake', () => {
  let server: TestServer
  let experimenter: TestActor
  let cavityId: string
  beforeAll(async () => {
    ;({ server, experimenter, cavityId } = await setup())
  })
  afterAll(() => server?.close())

  const upload = () => request(server.url).post(`/api/cavities/${cavityId}/traces`).set('Authorization', experimenter.authorization)

  it('when a gzip-compressed export is uploaded then its content is stored, named without .gz, and analysed', async () => {
    const csv = generatedTraceCsv({ seed: 11 })
    const response = await upload().attach('file', gzipSync(Buffer.from(csv)), 'scan-gz.csv.gz')
    expect(response.status, JSON.stringify(response.body)).toBe(202)
    const { trace, analysis } = response.body.uploads[0]
    expect(trace.fileName).toBe('scan-gz.csv')
    expect(trace.sizeBytes).toBe(Buffer.byteLength(csv))
    expect(trace.sha256).toBe(createHash('sha256').update(csv).digest('hex'))
    for (let k = 0; k < 300; k++) {
      const state = await request(server.url).get(`/api/analyses/${analysis.id}`).set('Authorization', experimenter.authorization)
      if (state.body.status === 'done' || state.body.status === 'failed') {
        expect(state.body.status, JSON.stringify(state.body.error)).toBe('done')
        return
      }
      await new Promise((resolve) => setTimeout(resolve, 100))
    }
    throw new Error('the analysis did not finish')
  })

  it('when an export compresses to more than 1 MiB then it is stored in pieces and downloads byte for byte', async () => {
    // Pseudo-random digits compress poorly, so about 4 MB of text stays over 1 MiB gzip-compressed.
    let state = 12345
    const next = () => (state = (state * 1103515245 + 12345) % 2147483648) / 2147483648
    const csv = `t,v\n${Array.from({ length: 200_000 }, (_, i) => `${i},${next().toFixed(12)}`).join('\n')}\n`
    const response = await upload().attach('file', Buffer.from(csv), 'pieces.csv')
    expect(response.status, JSON.stringify(response.body)).toBe(202)
    const id = response.body.uploads[0].trace.id
    const pieces = await server.db('trace_content_chunks').where({ trace_id: id }).count<{ count: string }[]>('* as count')
    expect(Number(pieces[0].count)).toBeGreaterThanOrEqual(2)
    expect((await server.db('traces').where({ id }).first('content_gzip')).content_gzip).toBeNull()
    const download = await request(server.url).get(`/api/traces/${id}/file`).set('Authorization', experimenter.authorization)
    expect(download.status).toBe(200)
    expect(createHash('sha256').update(download.text).digest('hex')).toBe(createHash('sha256').update(csv).digest('hex'))
  })

  it('when a binary file comes with a good export then 415 names it and nothing of the request is stored', async () => {
    const before = await traceCount(server)
    const binary = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0x00, 0x00, 0x00, 0x0d, 0x49, 0x48, 0x44, 0x52])
    const response = await upload().attach('file', Buffer.from(generatedTraceCsv({ seed: 12 })), 'good.csv').attach('file', binary, 'picture.png')
    expect(response.status).toBe(415)
    expect(response.body.error.code).toBe('not_text')
    expect(response.body.error.message).toMatch(/"picture.png" is not a text export/)
    expect(await traceCount(server)).toBe(before)
  })

  it('when a file is empty (or only blank lines, or an empty .gz) then 422 says so and nothing is stored', async () => {
    const before = await traceCount(server)
    for (const [content, name] of [[Buffer.alloc(0), 'empty.csv'], [Buffer.from('\n\n  \n'), 'blank.csv'], [gzipSync(Buffer.alloc(0)), 'empty.csv.gz']] as const) {
      const response = await upload().attach('file', content, name)
      expect(response.status, name).toBe(422)
      expect(response.body.error).toEqual({ code: 'empty_file', message: expect.stringContaining(`"${name}" is empty`) })
    }
    expect(await traceCount(server)).toBe(before)
  })

  it('when a browser sends a UTF-8 name in filename= then it is stored as sent and downloaded under filename*', async () => {
    const name = 'Messung-Spiegel-ä-µs.csv'
    const answer = await postRaw(server, experimenter, cavityId, Buffer.concat([filePart(boundary, `filename="${name}"`, generatedTraceCsv({ seed: 13 })), Buffer.from(`--${boundary}--\r\n`)]))
    expect(answer.status, answer.body).toBe(202)
    const trace = JSON.parse(answer.body).uploads[0].trace
    expect(trace.fileName).toBe(name)
    const download = await request(server.url).get(`/api/traces/${trace.id}/file`).set('Authorization', experimenter.authorization)
    expect(download.status).toBe(200)
    expect(download.headers['content-disposition']).toContain(`filename*=UTF-8''${encodeURIComponent(name)}`)
  })

  it('when a name comes as filename*=UTF-8 (RFC 8187) then it is stored and its download answers 200 with the name', async () => {
    const name = '名前.csv'
    const answer = await postRaw(server, experimenter, cavityId, Buffer.concat([filePart(boundary, `filename*=UTF-8''${encodeURIComponent(name)}`, generatedTraceCsv({ seed: 14 })), Buffer.from(`--${boundary}--\r\n`)]))
    expect(answer.status, answer.body).toBe(202)
    const trace = JSON.parse(answer.body).uploads[0].trace
    expect(trace.fileName).toBe(name)
    const download = await request(server.url).get(`/api/traces/${trace.id}/file`).set('Authorization', experimenter.authorization)
    expect(download.status).toBe(200)
    const star = /filename\*=UTF-8''([^;\s]+)/.exec(download.headers['content-disposition'])
    expect(decodeURIComponent(star?.[1] ?? '')).toBe(name)
  })

  it('when the multipart body is cut off before its last boundary then 400 truncated_upload and nothing is stored', async () => {
    const before = await traceCount(server)
    const cut = filePart(boundary, 'filename="cut.csv"', generatedTraceCsv({ seed: 15 })).subarray(0, 5000)
    const answer = await postRaw(server, experimenter, cavityId, cut)
    expect(answer.status, answer.body).toBe(400)
    expect(JSON.parse(answer.body).error.code).toBe('truncated_upload')
    expect(await traceCount(server)).toBe(before)
  })

  it('when Content-Length claims more than the request limit then 413 comes before any body is sent', async () => {
    const answer = await rawRequest(
      server.url,
      [`POST /api/cavities/${cavityId}/traces HTTP/1.1`, `Host: ${new URL(server.url).host}`, `Authorization: ${experimenter.authorization}`, `Content-Type: multipart/form-data; boundary=${boundary}`, `Content-Length: ${10 * 1024 ** 3}`].join('\r\n'),
    )
    expect(answer.status, answer.headers + answer.body).toBe(413)
    expect(JSON.parse(answer.body).error.message).toMatch(/declares 10240 MB; one upload may hold at most 1000 MB/)
  })
})

describe('upload limits while streaming', () => {
  let server: TestServer
  let experimenter: TestActor
  let cavityId: string
  beforeAll(async () => {
    ;({ server, experimenter, cavityId } = await setup({ UPLOAD_LIMIT_MB: '0.05', UPLOAD_TOTAL_LIMIT_MB: '0.08' }))
  })
  afterAll(() => server?.close())

  it('when files sent without Content-Length together pass the request limit then 413 and nothing is stored', async () => {
    const part = (name: string) => filePart(boundary, `filename="${name}"`, Buffer.alloc(45_000, '1,2,3\n'))
    const body = Buffer.concat([part('a.csv'), part('b.csv'), Buffer.from(`--${boundary}--\r\n`)])
    const { status, text } = await new Promise<{ status: number; text: string }>((resolve, reject) => {
      const { hostname, port } = new URL(server.url)
      const req = httpRequest({ hostname, port, method: 'POST', path: `/api/cavities/${cavityId}/traces`, headers: { Authorization: experimenter.authorization, 'Content-Type': `multipart/form-data; boundary=${boundary}`, 'Transfer-Encoding': 'chunked' } }, (res) => {
        let text = ''
        res.on('data', (chunk) => (text += chunk))
        res.on('end', () => resolve({ status: res.statusCode ?? 0, text }))
      })
      req.on('error', reject)
      for (let k = 0; k < body.length; k += 8192) req.write(body.subarray(k, k + 8192))
      req.end()
    })
    expect(status, text).toBe(413)
    expect(JSON.parse(text).error.code).toBe('upload_too_large')
    expect(await traceCount(server)).toBe(0)
  })

  it('when a small .gz expands past the file limit then 413 says so once decompressed', async () => {
    const bomb = gzipSync(Buffer.alloc(200_000, '0\n'))
    expect(bomb.length).toBeLessThan(50_000)
    const response = await request(server.url).post(`/api/cavities/${cavityId}/traces`).set('Authorization', experimenter.authorization).attach('file', bomb, 'bomb.csv.gz')
    expect(response.status).toBe(413)
    expect(response.body.error.message).toMatch(/"bomb.csv.gz" holds more than the upload limit .* once decompressed/)
    expect(await traceCount(server)).toBe(0)
  })
})
