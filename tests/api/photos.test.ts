// Photo uploads: streamed multipart with limits, content sniffing, re-encoding without metadata,
// storage on disk or in S3, serving only to the firm's own people.
import { randomUUID } from 'node:crypto'
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs'
import { request as httpRequest } from 'node:http'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { deflateSync } from 'node:zlib'
import pg from 'pg'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { requiredEnv, startApp, type TestApp } from '../support/app'
import { Client, signUpFirm, uniqueEmail } from '../support/client'
import { startFakeS3, type FakeS3 } from '../support/s3'
import { inviteAndJoin } from './support'

const MiB = 1024 * 1024
// the server's default limit (server/utils/multipart.ts)
const LIMIT = 15 * MiB

let app: TestApp
let storageDir: string

beforeAll(async () => {
  storageDir = mkdtempSync(join(tmpdir(), 'setwell-uploads-'))
  app = await startApp({ NUXT_STORAGE_DIR: storageDir })
})
afterAll(async () => {
  await app?.stop()
  if (storageDir) rmSync(storageDir, { recursive: true, force: true })
})

// ---------------------------------------------------------------------------------------------
// Rows the photos attach to, written straight into the database as the owner role (the
// customers and visits API is not this file's subject). RLS is forced, so set the firm first.

async function asFirm<T>(firmId: string, fn: (db: pg.Client) => Promise<T>): Promise<T> {
  const db = new pg.Client({ connectionString: requiredEnv('SETWELL_TEST_OWNER_DATABASE_URL') })
  await db.connect()
  try {
    await db.query('begin')
    await db.query(`select set_config('app.firm_id', $1, true)`, [firmId])
    const out = await fn(db)
    await db.query('commit')
    return out
  }
  catch (err) {
    await db.query('rollback').catch(() => {})
    throw err
  }
  finally {
    await db.end()
  }
}

interface Job { customerId: string, enquiryId: string, visitId: string, roomId: string, surfaceId: string, conditionId: string }

async function makeJob(firmId: string): Promise<Job> {
  return asFirm(firmId, async (db) => {
    const one = async (text: string, values: unknown[]) => (await db.query(text, values)).rows[0].id as string
    const customerId = await one(`insert into customers (firm_id, kind, name) values ($1, 'homeowner', 'Dora Quillfeather') returning id`, [firmId])
    const siteId = await one(`insert into sites (firm_id, customer_id, line1, town, postcode) values ($1, $2, '4 Lime Kiln Row', 'Exampleton', 'ZZ1 1ZZ') returning id`, [firmId, customerId])
    const enquiryId = await one(`insert into enquiries (firm_id, customer_id, site_id, source, description) values ($1, $2, $3, 'phone', 'Skim the back bedroom') returning id`, [firmId, customerId, siteId])
    const visitId = await one(`insert into visits (firm_id, customer_id, site_id, enquiry_id, starts_at) values ($1, $2, $3, $4, now()) returning id`, [firmId, customerId, siteId, enquiryId])
    const roomId = await one(`insert into rooms (firm_id, visit_id, name) values ($1, $2, 'Back bedroom') returning id`, [firmId, visitId])
    const surfaceId = await one(`insert into surfaces (firm_id, room_id, kind, length_mm, second_mm) values ($1, $2, 'wall', 3600, 2400) returning id`, [firmId, roomId])
    const conditionId = await one(`insert into conditions (firm_id, surface_id, kind, length_mm) values ($1, $2, 'crack', 900) returning id`, [firmId, surfaceId])
    return { customerId, enquiryId, visitId, roomId, surfaceId, conditionId }
  })
}

async function photoRow(firmId: string, id: string) {
  return asFirm(firmId, async db => (await db.query('select * from photos where id = $1', [id])).rows[0] ?? null)
}

async function photoCount(firmId: string) {
  return asFirm(firmId, async db => Number((await db.query('select count(*) from photos')).rows[0].count))
}

async function auditActions(firmId: string, entityId: string) {
  return asFirm(firmId, async db => (await db.query('select action, detail from audit_log where entity_id = $1 order by at, id', [entityId])).rows)
}

// ---------------------------------------------------------------------------------------------
// Pictures, made here

async function jpeg(width: number, height: number, colour = '#b5654f') {
  return sharp({ create: { width, height, channels: 3, background: colour } }).jpeg().toBuffer()
}

/** A JPEG carrying a camera make, GPS position, a comment and an orientation of 6 (turn 90° to be upright). */
async function jpegWithMetadata() {
  return sharp({ create: { width: 600, height: 200, channels: 3, background: '#4f7a5a' } })
    .jpeg()
    .withExif({
      IFD0: { Make: 'InventedCam', Model: 'Trowel 9', Copyright: 'Secret Person', ImageDescription: 'Flat 3 keysafe 4071' },
      IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 28/1 3900/100', GPSLongitudeRef: 'W', GPSLongitude: '0/1 7/1 3000/100' },
    })
    .withMetadata({ orientation: 6 })
    .toBuffer()
}

async function pngWithAlpha(width: number, height: number) {
  return sharp({ create: { width, height, channels: 4, background: { r: 38, g: 49, b: 59, alpha: 0.5 } } }).png().toBuffer()
}

function crc32(buf: Buffer) {
  let crc = 0xFFFFFFFF
  for (const byte of buf) {
    let c = (crc ^ byte) & 0xFF
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xEDB88320 ^ (c >>> 1) : c >>> 1
    crc = (crc >>> 8) ^ c
  }
  return (crc ^ 0xFFFFFFFF) >>> 0
}
function pngChunk(type: string, data: Buffer) {
  const len = Buffer.alloc(4)
  len.writeUInt32BE(data.length)
  const body = Buffer.concat([Buffer.from(type, 'latin1'), data])
  const crc = Buffer.alloc(4)
  crc.writeUInt32BE(crc32(body))
  return Buffer.concat([len, body, crc])
}
/** A valid one-colour PNG of width × height (1-bit palette): tens of kilobytes on disk, hundreds of megapixels decoded. */
function pixelBomb(width: number, height: number) {
  const ihdr = Buffer.alloc(13)
  ihdr.writeUInt32BE(width, 0)
  ihdr.writeUInt32BE(height, 4)
  ihdr[8] = 1 // bit depth
  ihdr[9] = 3 // palette
  const raw = Buffer.alloc((1 + Math.ceil(width / 8)) * height)
  return Buffer.concat([
    Buffer.from([137, 80, 78, 71, 13, 10, 26, 10]),
    pngChunk('IHDR', ihdr),
    pngChunk('PLTE', Buffer.from([224, 165, 146])),
    pngChunk('IDAT', deflateSync(raw, { level: 9 })),
    pngChunk('IEND', Buffer.alloc(0)),
  ])
}

// ---------------------------------------------------------------------------------------------
// HTTP

interface Res { status: number, body: any, headers: Headers }

async function asRes(res: Response): Promise<Res> {
  const text = await res.text()
  let body: any = text
  try {
    body = text ? JSON.parse(text) : null
  }
  catch { /* not JSON */ }
  return { status: res.status, body, headers: res.headers }
}

interface FilePart { data: Buffer, name?: string, type?: string }

async function upload(base: string, who: Client | null, fields: Record<string, string>, file?: FilePart, query = ''): Promise<Res> {
  const form = new FormData()
  for (const [k, v] of Object.entries(fields)) form.append(k, v)
  if (file) form.append('file', new Blob([new Uint8Array(file.data)], { type: file.type ?? 'image/jpeg' }), file.name ?? 'photo.jpg')
  const headers: Record<string, string> = who ? { cookie: who.cookieHeader() } : {}
  return asRes(await fetch(`${base}/api/photos/uploads${query}`, { method: 'POST', body: form, headers }))
}

async function getBytes(base: string, who: Client | null, path: string) {
  const res = await fetch(base + path, { headers: who ? { cookie: who.cookieHeader() } : {} })
  return { status: res.status, headers: res.headers, data: Buffer.from(await res.arrayBuffer()) }
}

/** A multipart body sent as a stream, so fetch uses chunked transfer encoding (no Content-Length). */
function chunkedMultipart(fields: Record<string, string>, fileBytes: number) {
  const boundary = `----setwell${randomUUID().replace(/-/g, '')}`
  const enc = new TextEncoder()
  const head = Object.entries(fields).map(([k, v]) => `--${boundary}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`).join('')
    + `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="big.jpg"\r\nContent-Type: image/jpeg\r\n\r\n`
  const tail = `\r\n--${boundary}--\r\n`
  const chunk = new Uint8Array(256 * 1024).fill(0x41)
  chunk.set([0xFF, 0xD8, 0xFF, 0xE0])
  let sent = 0
  let stage = 0
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (stage === 0) {
        controller.enqueue(enc.encode(head))
        stage = 1
      }
      else if (stage === 1) {
        controller.enqueue(chunk)
        sent += chunk.length
        if (sent >= fileBytes) stage = 2
      }
      else {
        controller.enqueue(enc.encode(tail))
        controller.close()
      }
    },
  })
  return { body, contentType: `multipart/form-data; boundary=${boundary}`, sent: () => sent }
}

function storedFile(dir: string, key: string) {
  return join(dir, ...key.split('/'))
}

function filesUnder(dir: string): string[] {
  if (!existsSync(dir)) return []
  return readdirSync(dir).flatMap((name) => {
    const p = join(dir, name)
    return statSync(p).isDirectory() ? filesUnder(p) : [p]
  })
}

// ---------------------------------------------------------------------------------------------

describe('uploading a photo', () => {
  it('takes a JPEG for a visit: 201, a row, the image and a smaller thumbnail stored and served back', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url, 'Lathe & Lime Plastering')
    const job = await makeJob(firmId)
    const original = await jpeg(3200, 2000)

    const res = await upload(app.url, owner, { visitId: job.visitId, caption: 'Blown render by the back door' }, { data: original, name: 'IMG_0042.jpg' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const { id } = res.body
    expect(res.body).toEqual({ id: expect.any(String), width: 2560, height: 1600, url: `/photos/${id}/full`, thumbUrl: `/photos/${id}/thumb` })

    const row = await photoRow(firmId, id)
    expect(row).toMatchObject({
      firm_id: firmId, visit_id: job.visitId, enquiry_id: null, surface_id: null, condition_id: null,
      content_type: 'image/jpeg', width: 2560, height: 1600, caption: 'Blown render by the back door', original_name: 'IMG_0042.jpg',
    })
    expect(row.uploaded_by).toMatch(/^[0-9a-f-]{36}$/)
    // random keys under the firm, not the photo id
    expect(row.storage_key).toMatch(new RegExp(`^photos/${firmId}/[0-9a-f]{32}\\.jpg$`))
    expect(row.thumb_key).toMatch(new RegExp(`^photos/${firmId}/[0-9a-f]{32}\\.jpg$`))
    expect(row.storage_key).not.toContain(id)
    expect(row.thumb_key).not.toBe(row.storage_key)

    const onDisk = readFileSync(storedFile(storageDir, row.storage_key))
    expect(onDisk.length).toBe(row.bytes)
    expect(await sharp(onDisk).metadata()).toMatchObject({ format: 'jpeg', width: 2560, height: 1600 })
    const thumbOnDisk = readFileSync(storedFile(storageDir, row.thumb_key))
    const thumbMeta = await sharp(thumbOnDisk).metadata()
    expect(thumbMeta).toMatchObject({ format: 'jpeg', width: 400, height: 250 })
    expect(thumbOnDisk.length).toBeLessThan(onDisk.length)

    const full = await getBytes(app.url, owner, res.body.url)
    expect(full.status).toBe(200)
    expect(full.data.equals(onDisk)).toBe(true)
    const thumb = await getBytes(app.url, owner, res.body.thumbUrl)
    expect(thumb.status).toBe(200)
    expect(thumb.data.equals(thumbOnDisk)).toBe(true)

    const meta = await owner.get(`/api/photos/${id}`)
    expect(meta.status).toBe(200)
    expect(meta.body).toMatchObject({ id, visitId: job.visitId, width: 2560, height: 1600, caption: 'Blown render by the back door', url: `/photos/${id}/full` })
    expect(meta.body).not.toHaveProperty('storageKey')

    const list = await owner.get(`/api/photos?visitId=${job.visitId}`)
    expect(list.status).toBe(200)
    expect(list.body.photos.map((p: any) => p.id)).toEqual([id])

    const audit = await auditActions(firmId, id)
    expect(audit.map((a: any) => a.action)).toEqual(['photo.uploaded'])
    expect(audit[0].detail).toMatchObject({ visitId: job.visitId, sniffedType: 'image/jpeg' })
  })

  it('takes a PNG for an enquiry and stores it as JPEG, keeping small pictures at their size', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const job = await makeJob(firmId)
    const res = await upload(app.url, owner, { enquiryId: job.enquiryId }, { data: await pngWithAlpha(800, 600), name: 'ceiling.png', type: 'image/png' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body).toMatchObject({ width: 800, height: 600 })
    const row = await photoRow(firmId, res.body.id)
    expect(row).toMatchObject({ enquiry_id: job.enquiryId, visit_id: null, content_type: 'image/jpeg' })
    const stored = readFileSync(storedFile(storageDir, row.storage_key))
    expect((await sharp(stored).metadata()).format).toBe('jpeg')
    const thumb = await sharp(readFileSync(storedFile(storageDir, row.thumb_key))).metadata()
    expect([thumb.width, thumb.height]).toEqual([400, 300])

    const list = await owner.get(`/api/photos?enquiryId=${job.enquiryId}`)
    expect(list.body.photos.map((p: any) => p.id)).toEqual([res.body.id])
    // not a photo of the visit
    expect((await owner.get(`/api/photos?visitId=${job.visitId}`)).body.photos).toEqual([])
  })

  it('takes the target from the query string as well as from the form', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const job = await makeJob(firmId)
    const res = await upload(app.url, owner, {}, { data: await jpeg(300, 300) }, `?visitId=${job.visitId}&caption=From%20the%20query`)
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(await photoRow(firmId, res.body.id)).toMatchObject({ visit_id: job.visitId, caption: 'From the query' })
  })

  it('stores the visit of a surface or a condition, so the visit lists their photos too', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const job = await makeJob(firmId)
    const onSurface = await upload(app.url, owner, { surfaceId: job.surfaceId }, { data: await jpeg(500, 400) })
    expect(onSurface.status, JSON.stringify(onSurface.body)).toBe(201)
    const onCondition = await upload(app.url, owner, { conditionId: job.conditionId }, { data: await jpeg(400, 500) })
    expect(onCondition.status, JSON.stringify(onCondition.body)).toBe(201)
    expect(await photoRow(firmId, onSurface.body.id)).toMatchObject({ surface_id: job.surfaceId, visit_id: job.visitId, condition_id: null })
    expect(await photoRow(firmId, onCondition.body.id)).toMatchObject({ condition_id: job.conditionId, visit_id: job.visitId })

    const ofVisit = await owner.get(`/api/photos?visitId=${job.visitId}`)
    expect(ofVisit.body.photos.map((p: any) => p.id).sort()).toEqual([onSurface.body.id, onCondition.body.id].sort())
    const ofSurface = await owner.get(`/api/photos?surfaceId=${job.surfaceId}`)
    expect(ofSurface.body.photos.map((p: any) => p.id)).toEqual([onSurface.body.id])
  })

  it('strips EXIF and GPS, and turns the picture upright from its orientation', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const job = await makeJob(firmId)
    const original = await jpegWithMetadata()
    // the test picture really carries what we mean to remove
    const before = await sharp(original).metadata()
    expect(before.exif?.includes('InventedCam')).toBe(true)
    expect(before.orientation).toBe(6)

    const res = await upload(app.url, owner, { visitId: job.visitId }, { data: original })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    // 600 × 200 turned a quarter: upright it is 200 wide and 600 high
    expect(res.body).toMatchObject({ width: 200, height: 600 })

    const row = await photoRow(firmId, res.body.id)
    for (const key of [row.storage_key, row.thumb_key]) {
      const stored = readFileSync(storedFile(storageDir, key))
      const meta = await sharp(stored).metadata()
      expect(meta.exif).toBeUndefined()
      expect(meta.xmp).toBeUndefined()
      expect(meta.iptc).toBeUndefined()
      expect(meta.icc).toBeUndefined()
      expect(meta.orientation).toBeUndefined()
      for (const secret of ['InventedCam', 'Secret Person', 'keysafe', 'GPS']) expect(stored.includes(secret)).toBe(false)
    }
    const served = await getBytes(app.url, owner, res.body.url)
    expect((await sharp(served.data).metadata()).exif).toBeUndefined()
  })
})

describe('a photo sent again from the phone\'s queue (clientId)', () => {
  it('stores it once: the resend answers 200 with the same photo, and nothing new is kept', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const job = await makeJob(firmId)
    const clientId = randomUUID()
    const picture = { data: await jpeg(900, 600), name: 'IMG_0101.jpg' }
    const first = await upload(app.url, owner, { visitId: job.visitId, clientId }, picture)
    expect(first.status, JSON.stringify(first.body)).toBe(201)
    const files = filesUnder(storageDir).length
    const again = await upload(app.url, owner, { visitId: job.visitId, clientId }, picture)
    expect(again.status).toBe(200)
    expect(again.body).toEqual(first.body)
    expect(await photoCount(firmId)).toBe(1)
    expect(filesUnder(storageDir).length).toBe(files)
    expect((await photoRow(firmId, first.body.id)).client_id).toBe(clientId)
    // another firm's phone-made id is its own: the same id there is a new photo
    const other = await signUpFirm(app.url)
    const theirJob = await makeJob(other.firmId)
    expect((await upload(app.url, other.client, { visitId: theirJob.visitId, clientId }, picture)).status).toBe(201)
    // not an id: 400 on the field
    const bad = await upload(app.url, owner, { visitId: job.visitId, clientId: 'photo-1' }, picture)
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields).toHaveProperty('clientId')
  })

  it('stores it once when the same photo arrives many times at once, and leaves no stray files', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const job = await makeJob(firmId)
    const clientId = randomUUID()
    const picture = { data: await jpeg(1200, 900), name: 'IMG_0102.jpg' }
    const before = filesUnder(storageDir).length
    let open!: () => void
    const gate = new Promise<void>((resolve) => {
      open = resolve
    })
    const calls = Array.from({ length: 10 }, () => gate.then(() => upload(app.url, owner, { visitId: job.visitId, clientId }, picture)))
    open()
    const answers = await Promise.all(calls)
    expect(answers.every(a => a.status === 200 || a.status === 201), JSON.stringify(answers.map(a => a.status))).toBe(true)
    expect(answers.filter(a => a.status === 201)).toHaveLength(1)
    expect(new Set(answers.map(a => a.body.id)).size).toBe(1)
    expect(await photoCount(firmId)).toBe(1)
    // the image and its thumbnail, once
    expect(filesUnder(storageDir).length).toBe(before + 2)
  })
})

describe('what is refused', () => {
  let owner: Client
  let firmId: string
  let job: Job
  beforeAll(async () => {
    ({ client: owner, firmId } = await signUpFirm(app.url))
    job = await makeJob(firmId)
  })

  it('refuses a web page renamed photo.jpg with 415, whatever it is called or declared as', async () => {
    const html = Buffer.from('<!doctype html><html><body><script>alert(document.cookie)</script></body></html>')
    const res = await upload(app.url, owner, { visitId: job.visitId }, { data: html, name: 'photo.jpg', type: 'image/jpeg' })
    expect(res.status).toBe(415)
    expect(res.body.data.fields.file).toMatch(/photo/i)
    // even with leading whitespace and no doctype
    const padded = await upload(app.url, owner, { visitId: job.visitId }, { data: Buffer.from('\n\n  <html><p>hi</p></html>'), name: 'photo.jpg' })
    expect(padded.status).toBe(415)
  })

  it('refuses SVG with 415', async () => {
    const svg = Buffer.from('<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><script>alert(1)</script><rect width="10" height="10"/></svg>')
    expect((await upload(app.url, owner, { visitId: job.visitId }, { data: svg, name: 'plan.svg', type: 'image/svg+xml' })).status).toBe(415)
    expect((await upload(app.url, owner, { visitId: job.visitId }, { data: svg, name: 'plan.png', type: 'image/png' })).status).toBe(415)
  })

  it('refuses other files that are not photos (a PDF, a GIF, random bytes) with 415', async () => {
    const pdf = Buffer.from('%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF')
    expect((await upload(app.url, owner, { visitId: job.visitId }, { data: pdf, name: 'quote.jpg' })).status).toBe(415)
    const gif = await sharp({ create: { width: 10, height: 10, channels: 3, background: '#000' } }).gif().toBuffer()
    expect((await upload(app.url, owner, { visitId: job.visitId }, { data: gif, name: 'x.gif', type: 'image/gif' })).status).toBe(415)
    expect((await upload(app.url, owner, { visitId: job.visitId }, { data: Buffer.alloc(5000, 7) })).status).toBe(415)
  })

  it('refuses a body that is not multipart with 415', async () => {
    const json = await owner.post('/api/photos/uploads', { visitId: job.visitId, file: 'aGVsbG8=' })
    expect(json.status).toBe(415)
    const raw = await owner.request('POST', `/api/photos/uploads?visitId=${job.visitId}`, (await jpeg(20, 20)).toString('latin1'), { 'content-type': 'image/jpeg' })
    expect(raw.status).toBe(415)
    // multipart without a boundary cannot be read
    const noBoundary = await owner.request('POST', '/api/photos/uploads', 'x', { 'content-type': 'multipart/form-data' })
    expect(noBoundary.status).toBe(415)
  })

  it('answers 400 without a file, without a target or with two, and for a bad id', async () => {
    const noFile = await upload(app.url, owner, { visitId: job.visitId })
    expect(noFile.status).toBe(400)
    expect(Object.keys(noFile.body.data.fields)).toEqual(['file'])
    const noTarget = await upload(app.url, owner, {}, { data: await jpeg(50, 50) })
    expect(noTarget.status).toBe(400)
    expect(Object.keys(noTarget.body.data.fields)).toEqual(['target'])
    const two = await upload(app.url, owner, { visitId: job.visitId, enquiryId: job.enquiryId }, { data: await jpeg(50, 50) })
    expect(two.status).toBe(400)
    const badId = await upload(app.url, owner, { visitId: 'visit-1' }, { data: await jpeg(50, 50) })
    expect(badId.status).toBe(400)
    expect(Object.keys(badId.body.data.fields)).toContain('visitId')
    const longCaption = await upload(app.url, owner, { visitId: job.visitId, caption: 'x'.repeat(501) }, { data: await jpeg(50, 50) })
    expect(longCaption.status).toBe(400)
    expect(Object.keys(longCaption.body.data.fields)).toEqual(['caption'])
    expect(await photoCount(firmId)).toBe(0)
  })

  it('answers 404 for a target that does not exist or is another firm\'s', async () => {
    const other = await signUpFirm(app.url)
    const theirs = await makeJob(other.firmId)
    for (const fields of [{ visitId: theirs.visitId }, { enquiryId: theirs.enquiryId }, { surfaceId: theirs.surfaceId }, { conditionId: theirs.conditionId }, { visitId: randomUUID() }]) {
      const res = await upload(app.url, owner, fields, { data: await jpeg(60, 60) })
      expect(res.status, JSON.stringify(fields)).toBe(404)
    }
    // in the query, refused before the body is read
    expect((await upload(app.url, owner, {}, { data: await jpeg(60, 60) }, `?visitId=${theirs.visitId}`)).status).toBe(404)
    expect(await photoCount(firmId)).toBe(0)
    expect(await photoCount(other.firmId)).toBe(0)
  })

  it('refuses a file over the limit with 413 when Content-Length says so', async () => {
    const big = Buffer.alloc(LIMIT + MiB, 0x41)
    big.set([0xFF, 0xD8, 0xFF, 0xE0])
    const res = await upload(app.url, owner, { visitId: job.visitId }, { data: big })
    expect(res.status).toBe(413)
    expect(res.body.data.fields.file).toMatch(/15 MB/)
  })

  it('refuses a declared length over the limit before the body is sent', async () => {
    // declare 200 MiB, send only the first part, and the answer still comes
    const boundary = 'setwellboundary'
    const answer = await new Promise<{ status: number, body: string }>((resolve, reject) => {
      const url = new URL(`${app.url}/api/photos/uploads`)
      const req = httpRequest({
        host: url.hostname, port: url.port, path: url.pathname, method: 'POST',
        headers: { 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': String(200 * MiB), 'cookie': owner.cookieHeader() },
      }, (res) => {
        let body = ''
        res.on('data', (d) => {
          body += d
        })
        res.on('end', () => resolve({ status: res.statusCode!, body }))
        res.on('error', reject)
      })
      req.on('error', reject)
      req.write(`--${boundary}\r\nContent-Disposition: form-data; name="visitId"\r\n\r\n${job.visitId}\r\n`)
      // no more is sent: the server must not wait for the other 200 MiB
      setTimeout(() => req.destroy(), 8000).unref()
    })
    expect(answer.status).toBe(413)
  })

  it('refuses a chunked upload (no Content-Length) with 413 once it passes the limit, and goes on working', async () => {
    const stream = chunkedMultipart({ visitId: job.visitId }, LIMIT + 2 * MiB)
    const res = await asRes(await fetch(`${app.url}/api/photos/uploads`, {
      method: 'POST',
      body: stream.body,
      duplex: 'half',
      headers: { 'content-type': stream.contentType, 'cookie': owner.cookieHeader() },
    } as RequestInit))
    expect(res.status).toBe(413)
    expect(await photoCount(firmId)).toBe(0)
    // the server is still there, and still takes a photo of ordinary size
    const ok = await upload(app.url, owner, { visitId: job.visitId }, { data: await jpeg(100, 100) })
    expect(ok.status).toBe(201)
    const del = await owner.delete(`/api/photos/${ok.body.id}`)
    expect(del.status).toBe(204)
  })

  it('takes a chunked upload under the limit', async () => {
    const data = await jpeg(640, 480)
    const boundary = 'setwellchunked'
    const parts = [
      `--${boundary}\r\nContent-Disposition: form-data; name="visitId"\r\n\r\n${job.visitId}\r\n`,
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="small.jpg"\r\nContent-Type: image/jpeg\r\n\r\n`,
    ]
    const body = new ReadableStream<Uint8Array>({
      start(c) {
        for (const p of parts) c.enqueue(new TextEncoder().encode(p))
        c.enqueue(new Uint8Array(data))
        c.enqueue(new TextEncoder().encode(`\r\n--${boundary}--\r\n`))
        c.close()
      },
    })
    const res = await asRes(await fetch(`${app.url}/api/photos/uploads`, {
      method: 'POST', body, duplex: 'half',
      headers: { 'content-type': `multipart/form-data; boundary=${boundary}`, 'cookie': owner.cookieHeader() },
    } as RequestInit))
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body).toMatchObject({ width: 640, height: 480 })
    expect((await owner.delete(`/api/photos/${res.body.id}`)).status).toBe(204)
  })

  it('refuses a picture of too many pixels (a small file that decodes to 400 megapixels) with 422', async () => {
    const bomb = pixelBomb(20000, 20000)
    expect(bomb.length).toBeLessThan(200 * 1024)
    const started = Date.now()
    const res = await upload(app.url, owner, { visitId: job.visitId }, { data: bomb, name: 'wall.png', type: 'image/png' })
    expect(res.status).toBe(422)
    expect(res.body.data.fields.file).toMatch(/megapixels/)
    // refused from the header, not after decoding 400 million pixels
    expect(Date.now() - started).toBeLessThan(3000)
    expect(await photoCount(firmId)).toBe(0)
  })

  it('refuses a second file in one upload with 400', async () => {
    const form = new FormData()
    form.append('visitId', job.visitId)
    form.append('file', new Blob([new Uint8Array(await jpeg(40, 40))], { type: 'image/jpeg' }), 'a.jpg')
    form.append('file', new Blob([new Uint8Array(await jpeg(40, 40))], { type: 'image/jpeg' }), 'b.jpg')
    const res = await asRes(await fetch(`${app.url}/api/photos/uploads`, { method: 'POST', body: form, headers: { cookie: owner.cookieHeader() } }))
    expect(res.status).toBe(400)
    expect(await photoCount(firmId)).toBe(0)
  })

  it('refuses a cross-site upload with 403', async () => {
    const form = new FormData()
    form.append('visitId', job.visitId)
    form.append('file', new Blob([new Uint8Array(await jpeg(40, 40))], { type: 'image/jpeg' }), 'a.jpg')
    const res = await fetch(`${app.url}/api/photos/uploads`, { method: 'POST', body: form, headers: { cookie: owner.cookieHeader(), origin: 'https://elsewhere.example' } })
    expect(res.status).toBe(403)
  })

  it('stores nothing for a refused upload', () => {
    // every refusal above left neither a row (checked in each) nor an object on disk for this firm
    expect(filesUnder(join(storageDir, 'photos', firmId))).toEqual([])
  })
})

describe('who may upload and see photos', () => {
  it('answers 401 to someone not signed in, for uploading, listing, details and bytes', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const job = await makeJob(firmId)
    const ok = await upload(app.url, owner, { visitId: job.visitId }, { data: await jpeg(80, 80) })
    expect(ok.status).toBe(201)
    const nobody = new Client(app.url)
    expect((await upload(app.url, null, { visitId: job.visitId }, { data: await jpeg(80, 80) })).status).toBe(401)
    expect((await nobody.get(`/api/photos?visitId=${job.visitId}`)).status).toBe(401)
    expect((await nobody.get(`/api/photos/${ok.body.id}`)).status).toBe(401)
    expect((await getBytes(app.url, null, ok.body.url)).status).toBe(401)
    expect((await getBytes(app.url, null, ok.body.thumbUrl)).status).toBe(401)
    expect((await nobody.delete(`/api/photos/${ok.body.id}`)).status).toBe(401)
  })

  it('lets crew add to and delete from their own visit only, and keeps the accountant out (403 to add, 404 to look)', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url, 'Cornice & Co')
    const job = await makeJob(firmId)
    const other = await makeJob(firmId)
    const { client: crew } = await inviteAndJoin(app, owner, uniqueEmail('crew'), 'crew', 'Cal Skimmer')
    const { client: accountant } = await inviteAndJoin(app, owner, uniqueEmail('books'), 'accountant', 'Ada Ledger')
    // the crew member is down to do the first visit only
    const crewId = (await crew.get('/api/me')).body.user.id
    await asFirm(firmId, db => db.query('update visits set visitor_user_id = $1 where id = $2', [crewId, job.visitId]))

    const byCrew = await upload(app.url, crew, { surfaceId: job.surfaceId }, { data: await jpeg(300, 200) })
    expect(byCrew.status, JSON.stringify(byCrew.body)).toBe(201)
    expect((await upload(app.url, crew, { visitId: other.visitId }, { data: await jpeg(300, 200) })).status).toBe(404)
    expect((await upload(app.url, crew, { enquiryId: job.enquiryId }, { data: await jpeg(300, 200) })).status).toBe(404)
    const byOwner = await upload(app.url, owner, { visitId: other.visitId }, { data: await jpeg(300, 200) })
    expect(byOwner.status).toBe(201)
    expect((await crew.get(`/api/photos/${byOwner.body.id}`)).status).toBe(404)
    expect((await getBytes(app.url, crew, byOwner.body.thumbUrl)).status).toBe(404)
    expect((await crew.delete(`/api/photos/${byOwner.body.id}`)).status).toBe(404)
    expect((await crew.get(`/api/photos?visitId=${job.visitId}`)).body.photos).toHaveLength(1)

    const byAccountant = await upload(app.url, accountant, { visitId: job.visitId }, { data: await jpeg(300, 200) })
    expect(byAccountant.status).toBe(403)
    expect(await photoCount(firmId)).toBe(2)
    // the accountant reads the money, not the site photos
    expect((await accountant.get(`/api/photos/${byCrew.body.id}`)).status).toBe(404)
    expect((await accountant.delete(`/api/photos/${byCrew.body.id}`)).status).toBe(403)

    expect((await crew.delete(`/api/photos/${byCrew.body.id}`)).status).toBe(204)
    expect(await photoCount(firmId)).toBe(1)
  })

  it('shows another firm\'s photo to no one: 404 for details, bytes, delete and its visit\'s list', async () => {
    const a = await signUpFirm(app.url, 'Firm A Plaster')
    const b = await signUpFirm(app.url, 'Firm B Render')
    const jobA = await makeJob(a.firmId)
    const res = await upload(app.url, a.client, { visitId: jobA.visitId }, { data: await jpeg(120, 90) })
    expect(res.status).toBe(201)
    const { id } = res.body

    const missing = await b.client.get(`/api/photos/${randomUUID()}`)
    const theirs = await b.client.get(`/api/photos/${id}`)
    expect(missing.status).toBe(404)
    expect(theirs.status).toBe(404)
    const { url: _u1, ...theirsBody } = theirs.body
    const { url: _u2, ...missingBody } = missing.body
    expect(theirsBody).toEqual(missingBody)
    expect((await getBytes(app.url, b.client, `/photos/${id}/full`)).status).toBe(404)
    expect((await getBytes(app.url, b.client, `/photos/${id}/thumb`)).status).toBe(404)
    expect((await getBytes(app.url, b.client, `/photos/${randomUUID()}/full`)).status).toBe(404)
    expect((await b.client.delete(`/api/photos/${id}`)).status).toBe(404)
    expect((await b.client.get(`/api/photos?visitId=${jobA.visitId}`)).status).toBe(404)
    // a malformed id or variant names nothing
    expect((await a.client.get('/api/photos/not-an-id')).status).toBe(404)
    expect((await getBytes(app.url, a.client, `/photos/${id}/original`)).status).toBe(404)
    // still there for its own firm
    expect((await getBytes(app.url, a.client, `/photos/${id}/full`)).status).toBe(200)
  })

  it('serves the bytes as an image that is not sniffed, under a name of ours, privately cached', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const job = await makeJob(firmId)
    const res = await upload(app.url, owner, { visitId: job.visitId }, { data: await jpeg(200, 150), name: '<img src=x onerror=alert(1)>.jpg' })
    expect(res.status).toBe(201)
    const { id } = res.body
    for (const [path, filename] of [[res.body.url, `photo-${id}.jpg`], [res.body.thumbUrl, `photo-${id}-thumb.jpg`]] as const) {
      const got = await getBytes(app.url, owner, path)
      expect(got.status).toBe(200)
      expect(got.headers.get('content-type')).toBe('image/jpeg')
      expect(got.headers.get('x-content-type-options')).toBe('nosniff')
      expect(got.headers.get('content-disposition')).toBe(`inline; filename="${filename}"`)
      expect(got.headers.get('cache-control')).toMatch(/^private\b/)
      expect(got.headers.get('content-security-policy')).toContain('sandbox')
      expect(got.headers.get('content-length')).toBe(String(got.data.length))
    }
    // the name is kept for display only, and only as JSON
    expect((await owner.get(`/api/photos/${id}`)).body.originalName).toBe('<img src=x onerror=alert(1)>.jpg')
  })

  it('deletes the row and both stored objects, and audits it', async () => {
    const { client: owner, firmId } = await signUpFirm(app.url)
    const job = await makeJob(firmId)
    const res = await upload(app.url, owner, { enquiryId: job.enquiryId }, { data: await jpeg(300, 300) })
    const row = await photoRow(firmId, res.body.id)
    expect(existsSync(storedFile(storageDir, row.storage_key))).toBe(true)
    expect(existsSync(storedFile(storageDir, row.thumb_key))).toBe(true)

    expect((await owner.delete(`/api/photos/${res.body.id}`)).status).toBe(204)
    expect(await photoRow(firmId, res.body.id)).toBeNull()
    expect(existsSync(storedFile(storageDir, row.storage_key))).toBe(false)
    expect(existsSync(storedFile(storageDir, row.thumb_key))).toBe(false)
    expect((await owner.get(`/api/photos/${res.body.id}`)).status).toBe(404)
    expect((await getBytes(app.url, owner, res.body.url)).status).toBe(404)
    expect((await owner.delete(`/api/photos/${res.body.id}`)).status).toBe(404)
    expect((await auditActions(firmId, res.body.id)).map((a: any) => a.action)).toEqual(['photo.uploaded', 'photo.deleted'])
  })
})

describe('storing in an S3-compatible bucket', () => {
  let s3: FakeS3
  let s3App: TestApp
  let emptyDir: string
  beforeAll(async () => {
    s3 = await startFakeS3()
    emptyDir = mkdtempSync(join(tmpdir(), 'setwell-uploads-unused-'))
    s3App = await startApp({ ...s3.env, NUXT_STORAGE_DIR: emptyDir })
  })
  afterAll(async () => {
    await s3App?.stop()
    await s3?.stop()
    if (emptyDir) rmSync(emptyDir, { recursive: true, force: true })
  })

  it('puts the image and thumbnail in the bucket, serves them back from it, and deletes them there', async () => {
    const { client: owner, firmId } = await signUpFirm(s3App.url)
    const job = await makeJob(firmId)
    const original = await jpegWithMetadata()
    const res = await upload(s3App.url, owner, { visitId: job.visitId }, { data: original })
    expect(res.status, `${JSON.stringify(res.body)}\n${s3App.output()}`).toBe(201)
    const row = await photoRow(firmId, res.body.id)
    const random = (key: string) => key.split('/').pop()!.replace(/\.jpg$/, '')

    // in the bucket, not on the app's disk
    const files = s3.files()
    expect(files.some(f => f.includes(random(row.storage_key)))).toBe(true)
    expect(files.some(f => f.includes(random(row.thumb_key)))).toBe(true)
    expect(filesUnder(emptyDir)).toEqual([])

    // read the object straight from the bucket's API: path-style, anonymous reads are allowed by the fake
    const direct = await fetch(`${s3.endpoint}/${s3.bucket}/${row.storage_key}`)
    expect(direct.status).toBe(200)
    const inBucket = Buffer.from(await direct.arrayBuffer())
    expect((await sharp(inBucket).metadata()).exif).toBeUndefined()

    const served = await getBytes(s3App.url, owner, res.body.url)
    expect(served.status).toBe(200)
    expect(served.data.equals(inBucket)).toBe(true)
    expect(served.data.length).toBe(row.bytes)

    expect((await owner.delete(`/api/photos/${res.body.id}`)).status).toBe(204)
    expect((await fetch(`${s3.endpoint}/${s3.bucket}/${row.storage_key}`)).status).toBe(404)
    expect((await fetch(`${s3.endpoint}/${s3.bucket}/${row.thumb_key}`)).status).toBe(404)
  })
})
