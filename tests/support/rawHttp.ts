/** Requests written byte by byte on a socket, for bodies no HTTP client would send (cut off, oversized claims). */
import { connect } from 'node:net'

export interface RawAnswer {
  status: number
  headers: string
  body: string
}

/** Send `head` (request line and headers, without the blank line) and `body`, then read the answer until the server closes. */
export function rawRequest(url: string, head: string, body: Buffer | string = ''): Promise<RawAnswer> {
  const { hostname, port } = new URL(url)
  return new Promise((resolve, reject) => {
    const socket = connect(Number(port), hostname)
    const chunks: Buffer[] = []
    socket.on('data', (chunk) => chunks.push(chunk))
    socket.on('error', reject)
    socket.on('close', () => {
      const text = Buffer.concat(chunks).toString('utf8')
      const [headers, ...rest] = text.split('\r\n\r\n')
      resolve({ status: Number(/^HTTP\/1\.1 (\d+)/.exec(headers)?.[1] ?? 0), headers, body: rest.join('\r\n\r\n') })
    })
    // No half-close: the server would read it as a request cut short. It closes after answering (Connection: close).
    socket.write(`${head}\r\nConnection: close\r\n\r\n`)
    socket.write(body)
  })
}

/** One multipart part carrying a file, with the Content-Disposition written exactly as given. */
export function filePart(boundary: string, disposition: string, content: Buffer | string): Buffer {
  return Buffer.concat([Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; ${disposition}\r\nContent-Type: text/csv\r\n\r\n`, 'utf8'), Buffer.from(content), Buffer.from('\r\n')])
}
