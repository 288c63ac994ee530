// A small HTTP client for the API tests, with a cookie jar (one per signed-in person).
import { randomUUID } from 'node:crypto'
import { runningApps } from './app'

export interface ApiResponse<T = any> { status: number, body: T, headers: Headers }

export class Client {
  private cookies = new Map<string, string>()
  constructor(readonly base: string, readonly defaults: Record<string, string> = {}) {}

  async request<T = any>(method: string, path: string, body?: unknown, headers: Record<string, string> = {}): Promise<ApiResponse<T>> {
    const h: Record<string, string> = { ...this.defaults, ...headers }
    if (this.cookies.size) h.cookie = [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ')
    let payload: string | undefined
    if (body !== undefined) {
      payload = typeof body === 'string' ? body : JSON.stringify(body)
      h['content-type'] ??= 'application/json'
    }
    const res = await fetch(this.base + path, { method, headers: h, body: payload, redirect: 'manual' })
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';')
      const i = pair!.indexOf('=')
      const name = pair!.slice(0, i)
      const value = pair!.slice(i + 1)
      if (value === '' || /max-age=0/i.test(c) || /expires=thu, 01 jan 1970/i.test(c)) this.cookies.delete(name)
      else this.cookies.set(name, value)
    }
    const text = await res.text()
    let parsed: any = text
    try {
      parsed = text ? JSON.parse(text) : null
    }
    catch { /* not JSON */ }
    return { status: res.status, body: parsed, headers: res.headers }
  }

  get<T = any>(path: string, headers?: Record<string, string>) { return this.request<T>('GET', path, undefined, headers) }
  post<T = any>(path: string, body?: unknown, headers?: Record<string, string>) { return this.request<T>('POST', path, body ?? {}, headers) }
  put<T = any>(path: string, body?: unknown, headers?: Record<string, string>) { return this.request<T>('PUT', path, body ?? {}, headers) }
  patch<T = any>(path: string, body?: unknown, headers?: Record<string, string>) { return this.request<T>('PATCH', path, body ?? {}, headers) }
  delete<T = any>(path: string, headers?: Record<string, string>) { return this.request<T>('DELETE', path, undefined, headers) }

  /** The sealed session cookie, to replay it from another client. */
  cookieHeader() { return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ') }
  setCookieHeader(header: string) {
    for (const part of header.split('; ')) {
      const i = part.indexOf('=')
      this.cookies.set(part.slice(0, i), part.slice(i + 1))
    }
  }
}

/** A unique e-mail address for a test, so files running at once never collide. */
export function uniqueEmail(label: string) {
  return `${label}-${randomUUID().slice(0, 8)}@test.example`
}

export const GOOD_PASSWORD = 'wet-edge-trowel-42'

/** The invented bank account test firms are given (account name: the trading name). */
export const TEST_BANK = { bankSortCode: '00-00-00', bankAccountNumber: '00000000' }

/**
 * The owner fills in the firm's bank account in its settings, as on the Firm page (through the
 * firm's own server, whatever database it runs on), the rest of the settings as they are.
 */
export async function giveBankAccount(owner: Client) {
  const firm = (await owner.get('/api/firm')).body
  const { id: _i, createdAt: _c, updatedAt: _u, enquiryFormKey: _k, referenceLetters: _l, ...settings } = firm
  const res = await owner.patch('/api/firm', { ...settings, takesTransfer: true, bankAccountName: firm.tradingName, ...TEST_BANK })
  if (res.status !== 200) throw new Error(`giveBankAccount: ${res.status} ${JSON.stringify(res.body)}`)
}

/**
 * Sign up a new firm and follow the link in the e-mail the server sent (the app at `base` must
 * have been started by this test process, tests/support/app.ts); returns its owner's client.
 * The firm takes payment by transfer (the default), so it is given an invented bank account, as
 * its owner would fill in, or its invoices could not be issued; `bank: false` leaves it without.
 */
export async function signUpFirm(base: string, firmName = 'Test Firm', opts: { bank?: boolean } = {}) {
  const client = new Client(base)
  const email = uniqueEmail('owner')
  const res = await client.post('/api/auth/sign-up', { firmName, name: 'Test Owner', email, password: GOOD_PASSWORD })
  if (res.status !== 202) throw new Error(`sign-up failed: ${res.status} ${JSON.stringify(res.body)}`)
  const app = runningApps.get(base)
  if (!app) throw new Error(`signUpFirm: no test app at ${base} (start it with startApp in this file)`)
  const mail = await app.waitForMail(email, /Confirm your e-mail/)
  const token = /\/sign-up\/([\w-]+)/.exec(mail.text ?? '')?.[1]
  if (!token) throw new Error(`signUpFirm: no sign-up link in:\n${mail.text}`)
  const confirmed = await client.post(`/api/auth/sign-up/${token}`)
  if (confirmed.status !== 200) throw new Error(`sign-up confirmation failed: ${confirmed.status} ${JSON.stringify(confirmed.body)}`)
  const firmId = confirmed.body.firmId as string
  if (opts.bank !== false) await giveBankAccount(client)
  return { client, email, firmId }
}

/**
 * A firm for a server whose mail goes nowhere (`base`): signed up through a server of the same
 * test database whose mail arrives (`mailBase`), then signed in at `base`.
 */
export async function signUpFirmAt(base: string, mailBase: string, firmName = 'Test Firm', opts: { bank?: boolean } = {}) {
  const made = await signUpFirm(mailBase, firmName, opts)
  const client = new Client(base)
  const res = await client.post('/api/auth/sign-in', { email: made.email, password: GOOD_PASSWORD })
  if (res.status !== 200) throw new Error(`sign-in at ${base} failed: ${res.status} ${JSON.stringify(res.body)}`)
  return { ...made, client }
}
