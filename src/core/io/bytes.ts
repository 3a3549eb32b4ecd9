/**
 * Small byte helpers shared by the readers: bounds-checked views and text decoding.
 */

/** Decode bytes as UTF-8 without throwing (invalid sequences become U+FFFD). Strips a leading BOM. */
export function decodeUtf8(bytes: Uint8Array): string {
  const text = new TextDecoder('utf-8', { fatal: false }).decode(bytes);
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** Text encoding announced by a byte order mark, or null (no BOM). */
export function textBom(bytes: Uint8Array): 'utf-8' | 'utf-16le' | 'utf-16be' | null {
  if (bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) return 'utf-8';
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) return 'utf-16le';
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) return 'utf-16be';
  return null;
}

/**
 * Decode text: UTF-16 (little or big endian) when a byte order mark says so (a spreadsheet's
 * "Unicode text"), else UTF-8. Invalid sequences become U+FFFD; the BOM is dropped.
 */
export function decodeText(bytes: Uint8Array): { text: string; encoding: 'utf-8' | 'utf-16le' | 'utf-16be' } {
  const bom = textBom(bytes);
  const encoding = bom ?? 'utf-8';
  const text = new TextDecoder(encoding, { fatal: false }).decode(bytes);
  return { text: text.charCodeAt(0) === 0xfeff ? text.slice(1) : text, encoding };
}

/** Encode a string as UTF-8 bytes. */
export function encodeUtf8(text: string): Uint8Array {
  return new TextEncoder().encode(text);
}

/**
 * True when the bytes look like text: no NUL byte and almost no other control characters
 * (tab, CR, LF, FF allowed) in the first 64 KiB (common practice for sniffing text files).
 */
export function looksLikeText(bytes: Uint8Array): boolean {
  const n = Math.min(bytes.length, 65536);
  if (n === 0) return false;
  let control = 0;
  for (let i = 0; i < n; i++) {
    const b = bytes[i];
    if (b === 0) return false;
    if (b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d && b !== 0x0c) control++;
  }
  return control / n < 0.01;
}

/** Hex dump of the first few bytes, e.g. "55 3a 01 00", for error messages. */
export function hexPrefix(bytes: Uint8Array, count = 4): string {
  return Array.from(bytes.subarray(0, count), (b) => b.toString(16).padStart(2, '0')).join(' ');
}
