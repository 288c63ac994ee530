import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { Client, GOOD_PASSWORD, signUpFirm, uniqueEmail } from '../support/client'

let app: TestApp

beforeAll(async () => {
  app = await startApp()
})
afterAll(async () => {
  await app?.stop()
})

describe('sign-up', () => {
  const linkIn = async (email: string) => /\/sign-up\/([\w-]+)/.exec((await app.waitForMail(email, /Confirm your e-mail/)).text ?? '')![1]!

  it('answers "check your e-mail" with no session; the link makes the firm and its owner and signs them in', async () => {
    const client = new Client(app.url)
    const email = uniqueEmail('signup')
    const res = await client.post('/api/auth/sign-up', { firmName: 'Larkspur Walls', name: 'Ada Quill', email: email.toUpperCase(), password: GOOD_PASSWORD })
    expect(res.status).toBe(202)
    expect(res.body.message).toMatch(/Check your e-mail/)
    expect((await client.get('/api/me')).status).toBe(401)
    const confirmed = await client.post(`/api/auth/sign-up/${await linkIn(email)}`)
    expect(confirmed.status).toBe(200)
    const me = await client.get('/api/me')
    expect(me.status).toBe(200)
    expect(me.body.user.email).toBe(email)
    expect(me.body.role).toBe('owner')
    expect(me.body.firm.tradingName).toBe('Larkspur Walls')
    expect(me.body.permissions).toContain('team:manage')
    // the password was kept only as a hash, and works
    expect((await new Client(app.url).post('/api/auth/sign-in', { email, password: GOOD_PASSWORD })).status).toBe(200)
  })

  it('answers an address that has an account exactly as a new one, and e-mails that address instead', async () => {
    const { email } = await signUpFirm(app.url)
    const res = await new Client(app.url).post('/api/auth/sign-up', { firmName: 'Second', name: 'Someone', email, password: GOOD_PASSWORD })
    expect(res.status).toBe(202)
    expect(res.headers.get('set-cookie')).toBeNull()
    expect((await app.waitForMail(email, /Someone tried to sign up/)).text).toMatch(/already has a Setwell account/)
  })

  it('answers 400 naming each bad field, and writes nothing', async () => {
    const email = uniqueEmail('bad')
    const res = await new Client(app.url).post('/api/auth/sign-up', { firmName: '', name: 'X', email, password: 'short' })
    expect(res.status).toBe(400)
    expect(res.body.data.fields).toMatchObject({ firmName: expect.any(String), password: expect.stringMatching(/10 characters/) })
    expect(res.body.data.fields.email).toBeUndefined()
    // the address is still free: nothing was written
    const again = new Client(app.url)
    expect((await again.post('/api/auth/sign-up', { firmName: 'Fine', name: 'X', email, password: GOOD_PASSWORD })).status).toBe(202)
    expect((await again.post(`/api/auth/sign-up/${await linkIn(email)}`)).status).toBe(200)
  })

  it('refuses a common password', async () => {
    const res = await new Client(app.url).post('/api/auth/sign-up', { firmName: 'F', name: 'N', email: uniqueEmail('common'), password: 'password123' })
    expect(res.status).toBe(400)
    expect(res.body.data.fields.password).toMatch(/guessed/)
  })
})

describe('sign-in', () => {
  it('signs in with the right password, with a new session id each time', async () => {
    const { email } = await signUpFirm(app.url)
    const a = new Client(app.url)
    expect((await a.post('/api/auth/sign-in', { email, password: GOOD_PASSWORD })).status).toBe(200)
    const first = a.cookieHeader()
    expect((await a.post('/api/auth/sign-in', { email, password: GOOD_PASSWORD })).status).toBe(200)
    expect(a.cookieHeader()).not.toBe(first)
    // the first session is a separate row that still works on its own
    const b = new Client(app.url)
    b.setCookieHeader(first)
    expect((await b.get('/api/me')).status).toBe(200)
    expect((await a.get('/api/me')).status).toBe(200)
  })

  it('gives the same vague answer for a wrong password and an unknown e-mail', async () => {
    const { email } = await signUpFirm(app.url)
    const wrong = await new Client(app.url).post('/api/auth/sign-in', { email, password: 'not-the-password-1' })
    const unknown = await new Client(app.url).post('/api/auth/sign-in', { email: uniqueEmail('nobody'), password: 'not-the-password-1' })
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.body.data).toEqual(unknown.body.data)
    expect(wrong.body.statusMessage).toBe(unknown.body.statusMessage)
  })

  it('answers 429 with Retry-After after 5 failures for one account and address, even for the right password', async () => {
    const { email } = await signUpFirm(app.url)
    const c = new Client(app.url)
    for (let i = 0; i < 5; i++) {
      expect((await c.post('/api/auth/sign-in', { email, password: `wrong-password-${i}` })).status).toBe(401)
    }
    const limited = await c.post('/api/auth/sign-in', { email, password: GOOD_PASSWORD })
    expect(limited.status).toBe(429)
    const retryAfter = Number(limited.headers.get('retry-after'))
    expect(retryAfter).toBeGreaterThan(14 * 60)
    expect(retryAfter).toBeLessThanOrEqual(15 * 60)
    // another account from the same address is not held up
    const other = await signUpFirm(app.url)
    expect((await new Client(app.url).post('/api/auth/sign-in', { email: other.email, password: GOOD_PASSWORD })).status).toBe(200)
  })

  it('counts failures per account: four failures then a success clears them', async () => {
    const { email } = await signUpFirm(app.url)
    const c = new Client(app.url)
    for (let i = 0; i < 4; i++) await c.post('/api/auth/sign-in', { email, password: `wrong-password-${i}` })
    expect((await c.post('/api/auth/sign-in', { email, password: GOOD_PASSWORD })).status).toBe(200)
    for (let i = 0; i < 4; i++) await c.post('/api/auth/sign-in', { email, password: `wrong-password-${i}` })
    expect((await c.post('/api/auth/sign-in', { email, password: GOOD_PASSWORD })).status).toBe(200)
  })
})

describe('sessions', () => {
  it('answers 401 with no session', async () => {
    const c = new Client(app.url)
    for (const path of ['/api/me', '/api/team', '/api/firm', '/api/audit']) {
      expect((await c.get(path)).status, path).toBe(401)
    }
  })

  it('ends the session at sign-out: a copied cookie stops working', async () => {
    const { client } = await signUpFirm(app.url)
    const copy = new Client(app.url)
    copy.setCookieHeader(client.cookieHeader())
    expect((await copy.get('/api/me')).status).toBe(200)
    expect((await client.post('/api/auth/sign-out')).status).toBe(200)
    expect((await client.get('/api/me')).status).toBe(401)
    expect((await copy.get('/api/me')).status).toBe(401)
  })

  it('a password change ends every other session, keeps this one, and retires the old password', async () => {
    const { client, email } = await signUpFirm(app.url)
    const phone = new Client(app.url)
    expect((await phone.post('/api/auth/sign-in', { email, password: GOOD_PASSWORD })).status).toBe(200)

    const wrong = await client.put('/api/me/password', { currentPassword: 'not-my-password', newPassword: 'fresh-float-finish-9' })
    expect(wrong.status).toBe(400)
    expect(Object.keys(wrong.body.data.fields)).toEqual(['currentPassword'])
    expect((await phone.get('/api/me')).status).toBe(200)

    const ok = await client.put('/api/me/password', { currentPassword: GOOD_PASSWORD, newPassword: 'fresh-float-finish-9' })
    expect(ok.status).toBe(200)
    expect((await client.get('/api/me')).status).toBe(200)
    expect((await phone.get('/api/me')).status).toBe(401)
    expect((await new Client(app.url).post('/api/auth/sign-in', { email, password: GOOD_PASSWORD })).status).toBe(401)
    expect((await new Client(app.url).post('/api/auth/sign-in', { email, password: 'fresh-float-finish-9' })).status).toBe(200)
  })

  it('ignores a forged cookie', async () => {
    const c = new Client(app.url)
    c.setCookieHeader('setwell-session=Fe26.2**forged**value')
    expect((await c.get('/api/me')).status).toBe(401)
  })
})
