// Where uploaded files live (photos now, perhaps PDFs later), behind unstorage so a firm's files
// can move from this machine's disk to an S3-compatible bucket by configuration alone:
//   NUXT_STORAGE_DRIVER  fs (default) or s3
//   NUXT_STORAGE_DIR     fs only: the folder (default <cwd>/.data/uploads)
//   NUXT_S3_ENDPOINT, NUXT_S3_BUCKET, NUXT_S3_REGION, NUXT_S3_ACCESS_KEY_ID, NUXT_S3_SECRET_ACCESS_KEY
// Keys are chosen by the server (`photos/<firmId>/<random>.jpg`), never taken from a request.
import { randomBytes } from 'node:crypto'
import { resolve } from 'node:path'
import { createStorage, type Storage } from 'unstorage'
import fsLiteDriver from 'unstorage/drivers/fs-lite'
import s3Driver from 'unstorage/drivers/s3'

export interface ObjectStore {
  /** `fs` or `s3`, for logs and tests. */
  readonly driver: 'fs' | 's3'
  put(key: string, data: Buffer): Promise<void>
  /** The bytes, or null when there is no such object. */
  get(key: string): Promise<Buffer | null>
  /** Remove an object; a missing one is not an error. */
  remove(key: string): Promise<void>
}

let store: ObjectStore | undefined

function env(name: string): string {
  return (process.env[name] ?? '').trim()
}

function required(name: string): string {
  const v = env(name)
  if (!v) throw new Error(`${name} is not set (NUXT_STORAGE_DRIVER=s3 needs it; see .env.example)`)
  return v
}

function makeStorage(): { driver: 'fs' | 's3', storage: Storage } {
  const driver = env('NUXT_STORAGE_DRIVER') || 'fs'
  if (driver === 's3') {
    return {
      driver: 's3',
      storage: createStorage({
        driver: s3Driver({
          endpoint: required('NUXT_S3_ENDPOINT'),
          bucket: required('NUXT_S3_BUCKET'),
          region: env('NUXT_S3_REGION') || 'auto',
          accessKeyId: required('NUXT_S3_ACCESS_KEY_ID'),
          secretAccessKey: required('NUXT_S3_SECRET_ACCESS_KEY'),
        }),
      }),
    }
  }
  if (driver !== 'fs') throw new Error(`NUXT_STORAGE_DRIVER must be fs or s3, not ${JSON.stringify(driver)}`)
  const base = env('NUXT_STORAGE_DIR') || resolve(process.cwd(), '.data/uploads')
  return { driver: 'fs', storage: createStorage({ driver: fsLiteDriver({ base }) }) }
}

/** The object store chosen by the environment (made once per process). */
export function useObjectStore(): ObjectStore {
  if (store) return store
  const { driver, storage } = makeStorage()
  store = {
    driver,
    async put(key, data) {
      await storage.setItemRaw(key, data)
    },
    async get(key) {
      const raw: unknown = await storage.getItemRaw(key)
      if (raw === null || raw === undefined) return null
      if (Buffer.isBuffer(raw)) return raw
      if (raw instanceof ArrayBuffer) return Buffer.from(raw)
      if (ArrayBuffer.isView(raw)) return Buffer.from(raw.buffer, raw.byteOffset, raw.byteLength)
      throw new Error(`storage returned ${typeof raw} for ${key}`)
    },
    async remove(key) {
      await storage.removeItem(key)
    },
  }
  return store
}

/** A key no one can guess or enumerate: `<prefix>/<firmId>/<32 hex>`, then the suffix (".jpg"). */
export function newObjectKey(prefix: string, firmId: string, suffix: string): string {
  return `${prefix}/${firmId}/${randomBytes(16).toString('hex')}${suffix}`
}
