/**
 * Read the subject and plain-text body of a single-part message, as this app's mailer sends them
 * (RFC 5322 headers; body 7bit, quoted-printable or base64 per RFC 2045; subject encoded words per
 * RFC 2047). Enough for the development outbox, not a general MIME parser.
 */

function decodeQuotedPrintable(text: string): Buffer {
  const joined = text.replace(/=\r?\n/g, '')
  const bytes: number[] = []
  for (let i = 0; i < joined.length; i++) {
    const hex = joined.slice(i + 1, i + 3)
    if (joined[i] === '=' && /^[0-9A-Fa-f]{2}$/.test(hex)) {
      bytes.push(parseInt(hex, 16))
      i += 2
    } else {
      bytes.push(...Buffer.from(joined[i], 'utf8'))
    }
  }
  return Buffer.from(bytes)
}

function decodeEncodedWords(value: string): string {
  return value.replace(/=\?([^?]+)\?([BbQq])\?([^?]*)\?=\s*/g, (_match, _charset: string, kind: string, data: string) =>
    kind.toUpperCase() === 'B' ? Buffer.from(data, 'base64').toString('utf8') : decodeQuotedPrintable(data.replace(/_/g, ' ')).toString('utf8'),
  )
}

export function parseMessage(raw: string): { subject: string; text: string } {
  const split = raw.search(/\r?\n\r?\n/)
  const headerText = split === -1 ? raw : raw.slice(0, split)
  const body = split === -1 ? '' : raw.slice(split).replace(/^\r?\n\r?\n/, '')
  const headers = new Map<string, string>()
  for (const line of headerText.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const colon = line.indexOf(':')
    if (colon > 0) headers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim())
  }
  const encoding = (headers.get('content-transfer-encoding') ?? '7bit').toLowerCase()
  const text =
    encoding === 'base64'
      ? Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8')
      : encoding === 'quoted-printable'
        ? decodeQuotedPrintable(body).toString('utf8')
        : body
  return { subject: decodeEncodedWords(headers.get('subject') ?? ''), text: text.replace(/\r\n/g, '\n').trimEnd() }
}
