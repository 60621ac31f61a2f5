// Password hashing with argon2id (@node-rs/argon2). Parameters follow the common
// recommendation of 19 MiB memory, two passes, one lane (OWASP password storage guidance).
import { hash, verify } from '@node-rs/argon2'

const options = { algorithm: 2, memoryCost: 19456, timeCost: 2, outputLen: 32, parallelism: 1 } as const

export function hashPassword(password: string): Promise<string> {
  return hash(password, options)
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password)
  }
  catch {
    return false
  }
}

let dummyHash: Promise<string> | undefined

/** Spends the same time as a real check when no account matches, so timing does not reveal accounts. */
export async function verifyAgainstDummy(password: string): Promise<false> {
  dummyHash ??= hashPassword('quillfield-no-such-account')
  await verifyPassword(await dummyHash, password)
  return false
}
