import { createHash, randomBytes } from 'node:crypto'

/** A random token for a link (invitations): 32 bytes, URL-safe. Only its hash is stored. */
export function newToken(): string {
  return randomBytes(32).toString('base64url')
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}
