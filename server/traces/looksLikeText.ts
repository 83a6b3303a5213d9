/**
 * True when the first bytes of a file read as text: no NUL byte and at most 1 % other control characters (tab,
 * line feed, carriage return, form feed, vertical tab and escape allowed). Any 8-bit encoding passes: labs export
 * in UTF-8 and in Latin-1 (µ, °).
 */
export function looksLikeText(head: Uint8Array): boolean {
  let control = 0
  for (const byte of head) {
    if (byte === 0) return false
    if (byte < 0x20 && byte !== 0x09 && byte !== 0x0a && byte !== 0x0d && byte !== 0x0c && byte !== 0x0b && byte !== 0x1b) control += 1
    if (byte === 0x7f) control += 1
  }
  return control <= head.length / 100
}
