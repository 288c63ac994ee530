import { createHash, randomBytes } from 'node:crypto'

/** A random secret for a link: 32 bytes, URL-safe (43 characters). Only its hash is stored. */
export function newToken(): string {
  return randomBytes(32).toString('base64url')
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}

/**
 * The firm's part at the front of a customer's or person's link: the firm's id in 22 URL-safe
 * characters. The link then finds its row by (firm_id, token_hash), one firm's rows, so the
 * schema can be spread across servers by firm (README "Scaling out", DEVELOPERS.md "Secret links").
 */
export const FIRM_PART_LENGTH = 22
/** A token's secret without the firm's part (newToken); the enquiry form's key is 32 hex characters. */
export const TOKEN_LENGTH = 43
export const FORM_KEY_LENGTH = 32

export function firmPart(firmId: string): string {
  return Buffer.from(firmId.replace(/-/g, ''), 'hex').toString('base64url')
}

/** The enquiry form's key as the firm's link carries it: the firm's part, then the key kept on the firm's row. */
export function publicFormKey(firmId: string, key: string): string {
  return firmPart(firmId) + key
}

/** A new link for a row of this firm: the token to send (firm's part, then the secret) and the hash to keep (of the secret). */
export function newLinkToken(firmId: string): { token: string, hash: string } {
  const secret = newToken()
  return { token: firmPart(firmId) + secret, hash: hashToken(secret) }
}

/**
 * A link as it came in the URL, split into its firm and its secret. A link made before links
 * carried their firm is the secret alone: firmId is null, and the row is found by the secret's
 * hash by itself (still works; see DEVELOPERS.md).
 */
export function splitLink(link: string, secretLength: number): { firmId: string | null, secret: string } {
  if (link.length !== FIRM_PART_LENGTH + secretLength) return { firmId: null, secret: link }
  const hex = Buffer.from(link.slice(0, FIRM_PART_LENGTH), 'base64url').toString('hex')
  if (hex.length !== 32) return { firmId: null, secret: link }
  const firmId = `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`
  return { firmId, secret: link.slice(FIRM_PART_LENGTH) }
}
