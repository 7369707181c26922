import { createHash, randomBytes } from 'node:crypto'

/** SHA-256 hex of an e-mailed token: the only form stored in the database. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}

/** A fresh 256-bit token (base64url) and its hash. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url')
  return { token, hash: hashToken(token) }
}
