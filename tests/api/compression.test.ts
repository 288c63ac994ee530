// What goes over the wire (issue 19): pages and JSON answers compressed as the browser asks (brotli
// or gzip), static files sent as the .br/.gz made at build, the build's hashed files kept a year,
// the service worker never kept, and the exports streamed as they were (not compressed).
// Read with node:http, which (unlike fetch) hands back the bytes as sent, then decoded here.
import { request } from 'node:http'
import { brotliDecompressSync, gunzipSync } from 'node:zlib'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startApp, type TestApp } from '../support/app'
import { signUpFirm, uniqueEmail, type Client } from '../support/client'

let app: TestApp
let owner: Client

beforeAll(async () => {
  app = await startApp()
  owner = (await signUpFirm(app.url, 'Wire Test Plastering')).client
  // enough customers that the list is well over the 1 KB below which nothing is compressed
  for (let i = 0; i < 15; i++) {
    const res = await owner.post('/api/customers', { customer: { kind: 'homeowner', name: `Wire Customer ${i} Longbottom`, email: uniqueEmail(`wire${i}`), billingLine1: `${i} Kiln Row`, billingPostcode: 'KB1 2AB' } })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
  }
})
afterAll(async () => {
  await app?.stop()
})

interface Wire { status: number, headers: Record<string, string | string[] | undefined>, raw: Buffer, body: Buffer }

/** GET as sent on the wire, and the body decoded by its content-encoding. */
function wire(path: string, headers: Record<string, string> = {}): Promise<Wire> {
  return new Promise((resolve, reject) => {
    const req = request(`${app.url}${path}`, { headers }, (res) => {
      const chunks: Buffer[] = []
      res.on('data', (c: Buffer) => chunks.push(c))
      res.on('end', () => {
        const raw = Buffer.concat(chunks)
        const enc = res.headers['content-encoding']
        const body = enc === 'br' ? brotliDecompressSync(raw) : enc === 'gzip' ? gunzipSync(raw) : raw
        resolve({ status: res.statusCode!, headers: res.headers, raw, body })
      })
      res.on('error', reject)
    })
    req.on('error', reject)
    req.end()
  })
}
const BROWSER = 'gzip, deflate, br, zstd'
const varies = (w: Wire) => String(w.headers.vary ?? '').toLowerCase().includes('accept-encoding')

describe('pages and API answers', () => {
  it('sends a page brotli-compressed to a browser that takes brotli, gzip to one that takes only gzip, and as it is to one that takes neither', async () => {
    const br = await wire('/sign-in', { 'accept-encoding': BROWSER })
    expect(br.status).toBe(200)
    expect(br.headers['content-encoding']).toBe('br')
    expect(varies(br)).toBe(true)
    expect(br.raw.length).toBeLessThan(br.body.length / 2)
    expect(br.body.toString('utf8')).toMatch(/^<!DOCTYPE html>/i)

    const gz = await wire('/sign-in', { 'accept-encoding': 'gzip' })
    expect(gz.headers['content-encoding']).toBe('gzip')
    const plain = await wire('/sign-in')
    expect(plain.headers['content-encoding']).toBeUndefined()
    // the same page, whatever the wrapping (the build's script names and the markup)
    const scripts = (html: string) => [...html.matchAll(/\/_nuxt\/[\w.-]+\.js/g)].map(m => m[0]).sort()
    expect(scripts(br.body.toString('utf8'))).toEqual(scripts(plain.body.toString('utf8')))
    expect(scripts(gz.body.toString('utf8'))).toEqual(scripts(plain.body.toString('utf8')))
  })

  it('sends a signed-in JSON answer compressed, and it reads back as the same answer', async () => {
    const cookie = owner.cookieHeader()
    const br = await wire('/api/customers', { 'accept-encoding': BROWSER, cookie })
    expect(br.status).toBe(200)
    expect(br.headers['content-encoding']).toBe('br')
    expect(varies(br)).toBe(true)
    const plain = await wire('/api/customers', { cookie })
    expect(plain.headers['content-encoding']).toBeUndefined()
    expect(plain.raw.length).toBeGreaterThan(1024)
    expect(JSON.parse(br.body.toString('utf8'))).toEqual(JSON.parse(plain.body.toString('utf8')))
    // a server-drawn page of the firm too
    const page = await wire('/customers', { 'accept-encoding': 'gzip', cookie })
    expect(page.status).toBe(200)
    expect(page.headers['content-encoding']).toBe('gzip')
    expect(page.body.toString('utf8')).toContain('Wire Customer 3 Longbottom')
  })

  it('leaves a small answer as it is (under 1 KB compression costs more than it saves)', async () => {
    const health = await wire('/api/health', { 'accept-encoding': BROWSER })
    expect(health.status).toBe(200)
    expect(health.headers['content-encoding']).toBeUndefined()
  })

  it('streams an export as it is, even to a browser that takes brotli', async () => {
    const cookie = owner.cookieHeader()
    const today = new Date().toISOString().slice(0, 10)
    const invoices = await wire(`/exports/invoices.csv?quarterOf=${today}`, { 'accept-encoding': BROWSER, cookie })
    expect(invoices.status).toBe(200)
    expect(invoices.headers['content-type']).toBe('text/csv; charset=utf-8')
    expect(invoices.headers['content-encoding']).toBeUndefined()
    expect(invoices.headers['transfer-encoding']).toBe('chunked')
    const zip = await wire(`/exports/quarter.zip?quarterOf=${today}`, { 'accept-encoding': BROWSER, cookie })
    expect(zip.status).toBe(200)
    expect(zip.headers['content-encoding']).toBeUndefined()
    expect(zip.raw.subarray(0, 2).toString('latin1')).toBe('PK')
  })
})

describe('static files', () => {
  it('sends the build\'s scripts and styles as the .br or .gz made at build, kept a year as immutable', async () => {
    const html = (await wire('/sign-in')).body.toString('utf8')
    const assets = [...new Set([...html.matchAll(/\/_nuxt\/[\w.-]+\.(?:js|css)/g)].map(m => m[0]))]
    expect(assets.length).toBeGreaterThan(0)
    for (const path of assets) {
      const plain = await wire(path)
      if (plain.raw.length < 1024) continue
      const br = await wire(path, { 'accept-encoding': BROWSER })
      expect(br.headers['content-encoding'], path).toBe('br')
      expect(br.headers['cache-control'], path).toBe('public, max-age=31536000, immutable')
      expect(varies(br), path).toBe(true)
      expect(br.body.equals(plain.raw), path).toBe(true)
      const gz = await wire(path, { 'accept-encoding': 'gzip' })
      expect(gz.headers['content-encoding'], path).toBe('gzip')
      expect(gz.body.equals(plain.raw), path).toBe(true)
    }
  })

  it('never lets the service worker be kept, and whatever the encoding asked for, it is the worker with its precache list', async () => {
    const manifest = await wire('/manifest.webmanifest')
    expect(manifest.status).toBe(200)
    expect(manifest.headers['cache-control']).toBe('no-cache')
    const plain = await wire('/sw.js')
    expect(plain.status).toBe(200)
    expect(plain.headers['cache-control']).toBe('no-cache')
    expect(plain.body.toString('utf8')).toContain('"url":"')
    for (const enc of ['br', 'gzip']) {
      const packed = await wire('/sw.js', { 'accept-encoding': enc })
      expect(packed.headers['cache-control']).toBe('no-cache')
      expect(packed.body.toString('utf8'), enc).toBe(plain.body.toString('utf8'))
    }
  })

  it('does not keep a page: no long cache on HTML, and a missing build file is not kept either', async () => {
    const page = await wire('/sign-in', { 'accept-encoding': BROWSER })
    expect(String(page.headers['cache-control'] ?? '')).not.toMatch(/max-age=[1-9]|immutable/)
    const missing = await wire('/_nuxt/not-a-build-file.js')
    expect(missing.status).toBe(404)
    expect(String(missing.headers['cache-control'] ?? '')).not.toMatch(/immutable/)
  })
})
