// A local S3-compatible server (@20minutes/s3rver) on 127.0.0.1 in the test process, with one
// bucket, storing under a temporary folder; and the environment that points the app at it.
import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs'
import { createRequire } from 'node:module'
import { tmpdir } from 'node:os'
import { join } from 'node:path'

// s3rver ships no types; it is CommonJS
const S3rver = createRequire(import.meta.url)('@20minutes/s3rver') as new (options: Record<string, unknown>) => {
  run(): Promise<{ address: string, port: number }>
  close(): Promise<void>
}

export interface FakeS3 {
  endpoint: string
  bucket: string
  /** Environment for startApp: NUXT_STORAGE_DRIVER=s3 and the S3 settings. */
  env: Record<string, string>
  /** Every file under the fake's folder (its on-disk form of the objects). */
  files(): string[]
  stop(): Promise<void>
}

/** s3rver checks request signatures against these fixed credentials. */
const ACCESS_KEY = 'S3RVER'
const SECRET_KEY = 'S3RVER'

export async function startFakeS3(bucket = 'setwell-test'): Promise<FakeS3> {
  const directory = mkdtempSync(join(tmpdir(), 'setwell-s3-'))
  const server = new S3rver({
    address: '127.0.0.1',
    port: 0,
    silent: true,
    directory,
    configureBuckets: [{ name: bucket }],
    vhostBuckets: false,
  })
  const { port } = await server.run()
  const endpoint = `http://127.0.0.1:${port}`
  const walk = (dir: string): string[] => readdirSync(dir).flatMap((name) => {
    const p = join(dir, name)
    return statSync(p).isDirectory() ? walk(p) : [p]
  })
  return {
    endpoint,
    bucket,
    env: {
      NUXT_STORAGE_DRIVER: 's3',
      NUXT_S3_ENDPOINT: endpoint,
      NUXT_S3_BUCKET: bucket,
      NUXT_S3_REGION: 'us-east-1',
      NUXT_S3_ACCESS_KEY_ID: ACCESS_KEY,
      NUXT_S3_SECRET_ACCESS_KEY: SECRET_KEY,
    },
    files: () => walk(directory),
    async stop() {
      await server.close()
      rmSync(directory, { recursive: true, force: true })
    },
  }
}
