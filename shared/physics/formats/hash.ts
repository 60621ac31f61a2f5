// SHA-256 (FIPS 180-4, Secure Hash Standard) through the Web Crypto API, and format-independent
// checksums of configurations: the hash of a canonical byte string, so that the same points give
// the same checksum whether they came from CSV, JSON or NPY.
//   configuration: uint32 LE d, uint32 LE N, then the N·d coordinates as IEEE 754 binary64 LE
//   ensemble:      uint32 LE M, then each configuration's canonical bytes in order
import type { Configuration } from '../types'
import type { PointEnsemble } from './ensemble'

/** Lower-case hexadecimal SHA-256 digest of the bytes. */
export async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const own = bytes.buffer instanceof ArrayBuffer ? new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength) : new Uint8Array(bytes)
  const digest = new Uint8Array(await globalThis.crypto.subtle.digest('SHA-256', own))
  const hex: string[] = []
  for (const b of digest) hex.push(b.toString(16).padStart(2, '0'))
  return hex.join('')
}

function checkConfiguration(c: Configuration): void {
  if (!(Number.isInteger(c.N) && c.N >= 0 && c.N <= 0xffffffff && Number.isInteger(c.d) && c.d >= 0 && c.d <= 0xffffffff)) {
    throw new RangeError(`configuration checksum: N = ${c.N} and d = ${c.d} must be integers in [0, 2^32)`)
  }
  if (c.points.length !== c.N * c.d) throw new RangeError(`configuration checksum: ${c.points.length} values, expected N·d = ${c.N * c.d}`)
}

function writeConfiguration(view: DataView, offset: number, c: Configuration): number {
  view.setUint32(offset, c.d, true)
  view.setUint32(offset + 4, c.N, true)
  let o = offset + 8
  for (let k = 0; k < c.points.length; k++) {
    view.setFloat64(o, c.points[k], true)
    o += 8
  }
  return o
}

/** The canonical bytes of one configuration (see the header of this file). */
export function configurationBytes(c: Configuration): Uint8Array {
  checkConfiguration(c)
  const out = new Uint8Array(8 + 8 * c.points.length)
  writeConfiguration(new DataView(out.buffer), 0, c)
  return out
}

/** SHA-256 of the configuration's canonical bytes, in hexadecimal. */
export function configurationChecksum(c: Configuration): Promise<string> {
  return sha256Hex(configurationBytes(c))
}

/** SHA-256 of the ensemble's canonical bytes (labels are not included), in hexadecimal. */
export function ensembleChecksum(ensemble: PointEnsemble): Promise<string> {
  const cs = ensemble.configurations
  cs.forEach(checkConfiguration)
  const size = cs.reduce((s, c) => s + 8 + 8 * c.points.length, 4)
  const out = new Uint8Array(size)
  const view = new DataView(out.buffer)
  view.setUint32(0, cs.length, true)
  let offset = 4
  for (const c of cs) offset = writeConfiguration(view, offset, c)
  return sha256Hex(out)
}
