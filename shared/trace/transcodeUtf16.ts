/**
 * Some Windows acquisition programs save text as UTF-16 with a byte-order mark. The reader scans bytes as an
 * ASCII-compatible encoding, so such input is re-encoded as UTF-8 first; anything else is returned unchanged.
 */
export function transcodeUtf16(bytes: Uint8Array): Uint8Array {
  if (bytes.length < 2) return bytes
  const littleEndian = bytes[0] === 0xff && bytes[1] === 0xfe
  const bigEndian = bytes[0] === 0xfe && bytes[1] === 0xff
  if (!littleEndian && !bigEndian) return bytes
  const text = new TextDecoder(littleEndian ? 'utf-16le' : 'utf-16be').decode(bytes)
  return new TextEncoder().encode(text)
}
