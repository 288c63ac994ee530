import { randomUUID } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { firmPart, FORM_KEY_LENGTH, hashToken, newLinkToken, publicFormKey, splitLink, TOKEN_LENGTH } from '../../server/utils/tokens'

// A customer's or person's link carries its firm (server/utils/tokens.ts): the firm's id in 22
// URL-safe characters, then the secret. The row is found by (firm_id, hash of the secret).
describe('links that carry their firm', () => {
  it('a new link splits back into its firm and the secret whose hash is kept', () => {
    for (let i = 0; i < 50; i++) {
      const firmId = randomUUID()
      const { token, hash } = newLinkToken(firmId)
      expect(token).toMatch(/^[\w-]{65}$/)
      expect(token.startsWith(firmPart(firmId))).toBe(true)
      const { firmId: back, secret } = splitLink(token, TOKEN_LENGTH)
      expect(back).toBe(firmId)
      expect(secret).toHaveLength(TOKEN_LENGTH)
      expect(hashToken(secret)).toBe(hash)
    }
  })

  it('a link from before (the secret alone) names no firm and keeps its secret whole', () => {
    const old = newLinkToken(randomUUID()).token.slice(22)
    expect(splitLink(old, TOKEN_LENGTH)).toEqual({ firmId: null, secret: old })
    const oldKey = '0f'.repeat(16)
    expect(splitLink(oldKey, FORM_KEY_LENGTH)).toEqual({ firmId: null, secret: oldKey })
  })

  it('the enquiry form key: the firm\'s part, then the key kept on the firm', () => {
    const firmId = randomUUID()
    const key = 'a1'.repeat(16)
    expect(splitLink(publicFormKey(firmId, key), FORM_KEY_LENGTH)).toEqual({ firmId, secret: key })
  })

  it('a link of any other length is taken as it is (it will match nothing)', () => {
    expect(splitLink('x'.repeat(64), TOKEN_LENGTH)).toEqual({ firmId: null, secret: 'x'.repeat(64) })
    expect(splitLink('', TOKEN_LENGTH)).toEqual({ firmId: null, secret: '' })
  })
})
