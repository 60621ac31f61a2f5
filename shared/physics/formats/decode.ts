// Decoding of uploaded text as UTF-8 (RFC 3629), with a located error for invalid bytes.
// A leading byte-order mark is dropped; UTF-16 files are refused with advice.
import { inputError } from './location'

/** Returns the text of `input` (a string is returned without its byte-order mark). */
export function decodeText(input: Uint8Array | string, file: string): string {
  if (typeof input === 'string') return input.charCodeAt(0) === 0xfeff ? input.slice(1) : input
  if (input.length >= 2 && ((input[0] === 0xff && input[1] === 0xfe) || (input[0] === 0xfe && input[1] === 0xff))) {
    throw inputError('the file is UTF-16 text; save it as UTF-8 (or plain ASCII) and upload again', { file, line: 1, column: 1 })
  }
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(input)
  }
  catch {
    // Locate the first invalid byte through the lenient decoding (it marks it with U+FFFD).
    const loose = new TextDecoder('utf-8').decode(input)
    const at = loose.indexOf('\ufffd')
    let line = 1
    let lineStart = 0
    for (let i = 0; i < at; i++) {
      if (loose.charCodeAt(i) === 10) {
        line++
        lineStart = i + 1
      }
    }
    throw inputError('the file is not valid UTF-8 text (is it a binary file?)', { file, line, column: at - lineStart + 1 })
  }
}
