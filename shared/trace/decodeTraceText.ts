import { EngineError } from '../errors'

/** What the decoder found out about the bytes. */
export interface DecodedTraceText {
  text: string
  encoding: 'utf-8' | 'latin-1'
  /** True when `text` holds the whole file, false when only its first lines were decoded. */
  complete: boolean
  /** Byte offset in the input of a character offset in `text`. */
  byteOffset(charOffset: number): number
}

export interface DecodeTraceTextOptions {
  /** Largest accepted input in bytes. @default 209715200 (200 MiB) */
  maxBytes?: number
  /** Decode only this many first lines (the body is read from the bytes directly). @default Infinity */
  headLines?: number
}

const DEFAULT_MAX_BYTES = 200 * 1024 * 1024
/** How much of the start of the file is inspected for binary or markup content. */
const SNIFF_BYTES = 8192
/** The decoded head never exceeds this, however long its lines (a wide or broken file). */
const HEAD_BYTES = 1024 * 1024

/**
 * Turn uploaded bytes into text: refuse empty, oversized, binary and HTML/XML input, decode UTF-8 and fall
 * back to Latin-1 (Windows-1252) when the bytes are not valid UTF-8 (older exports write "µs" as 0xB5).
 */
export function decodeTraceText(bytes: Uint8Array, options: DecodeTraceTextOptions = {}): DecodedTraceText {
  const { maxBytes = DEFAULT_MAX_BYTES, headLines = Infinity } = options
  assertBytes(bytes)
  if (bytes.length > maxBytes) {
    throw new EngineError(
      'file_too_large',
      `The file is ${formatMiB(bytes.length)}, more than the limit of ${formatMiB(maxBytes)}.`,
    )
  }
  if (bytes.length === 0 || isAllWhitespace(bytes)) {
    throw new EngineError('empty_file', 'The file is empty: it holds no samples.')
  }
  assertNotBinary(bytes)

  const end = endOfLines(bytes, headLines)
  const part = end === bytes.length ? bytes : bytes.subarray(0, end)
  let text: string
  let encoding: DecodedTraceText['encoding'] = 'utf-8'
  try {
    text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(part)
  } catch {
    text = new TextDecoder('windows-1252').decode(part)
    encoding = 'latin-1'
  }
  assertNotMarkup(text)
  const bomBytes = encoding === 'utf-8' && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0
  const byteOffset = (charOffset: number): number =>
    encoding === 'latin-1' ? charOffset : bomBytes + new TextEncoder().encode(text.slice(0, charOffset)).length
  return { text, encoding, complete: end === bytes.length, byteOffset }
}

/** Byte offset just after the first `lines` line ends, the end of the input, or at most HEAD_BYTES in. */
function endOfLines(bytes: Uint8Array, lines: number): number {
  if (!Number.isFinite(lines)) return bytes.length
  // Old files end lines with a bare carriage return: count those when there is no line feed at all.
  const end = bytes.indexOf(0x0a) >= 0 ? 0x0a : 0x0d
  let position = 0
  for (let k = 0; k < lines; k++) {
    const found = bytes.indexOf(end, position)
    if (found < 0) return bytes.length <= HEAD_BYTES || position === 0 ? utf8Boundary(bytes, HEAD_BYTES) : position
    if (found >= HEAD_BYTES) return position > 0 ? position : utf8Boundary(bytes, HEAD_BYTES)
    position = found + 1
  }
  return position
}

/** Step back from `offset` to the start of a UTF-8 sequence, so a cut never splits a character. */
function utf8Boundary(bytes: Uint8Array, offset: number): number {
  let at = Math.min(offset, bytes.length)
  while (at > 0 && at < bytes.length && (bytes[at] & 0xc0) === 0x80) at--
  return at
}

function assertBytes(bytes: unknown): asserts bytes is Uint8Array {
  if (!(bytes instanceof Uint8Array)) {
    throw new EngineError('invalid_input', 'The trace must be given as bytes (a Uint8Array).')
  }
}

function isAllWhitespace(bytes: Uint8Array): boolean {
  for (let i = 0; i < bytes.length; i++) {
    const b = bytes[i]
    if (b !== 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d && b !== 0x0c) return false
  }
  return true
}

function assertNotBinary(bytes: Uint8Array): void {
  const end = Math.min(bytes.length, SNIFF_BYTES)
  let control = 0
  for (let i = 0; i < end; i++) {
    const b = bytes[i]
    if (b === 0) {
      throw new EngineError('binary_file', 'The file is binary (it contains NUL bytes), not a text export of samples.')
    }
    if (b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d && b !== 0x0c) control++
  }
  // Text exports carry no control characters besides tab and line ends; a few stray ones are tolerated.
  if (control > Math.max(4, end * 0.01)) {
    throw new EngineError('binary_file', 'The file is binary (it contains control bytes), not a text export of samples.')
  }
}

function assertNotMarkup(text: string): void {
  const head = text.slice(0, SNIFF_BYTES).replace(/^\uFEFF/, '').trimStart().toLowerCase()
  if (head.startsWith('<') && /^<(?:!doctype|html|head|body|\?xml|table|div|!--|svg)/.test(head)) {
    throw new EngineError('html_file', 'The file is an HTML or XML page, not a text export of samples.')
  }
}

function formatMiB(bytes: number): string {
  return `${(bytes / (1024 * 1024)).toFixed(1)} MiB`
}
