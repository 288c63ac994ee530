// Small process helpers shared by the start and test scripts.
import { spawn, spawnSync } from 'node:child_process'
import { existsSync, statSync } from 'node:fs'
import { createServer } from 'node:net'
import { join } from 'node:path'
import { setTimeout as sleep } from 'node:timers/promises'
import { root } from './env.mjs'

export const bin = name => join(root, 'node_modules/.bin', name)

/** Run a command to completion, streaming its output; throw with its name if it fails. */
export function run(cmd, args, opts = {}) {
  const res = spawnSync(cmd, args, { stdio: 'inherit', cwd: root, ...opts })
  if (res.status !== 0) {
    const err = new Error(`${[cmd, ...args].join(' ')} exited with ${res.status ?? res.signal}`)
    err.exitCode = res.status ?? 1
    throw err
  }
}

/** `npm ci` when node_modules is missing or older than package-lock.json. */
export function ensureDependencies() {
  const lock = join(root, 'package-lock.json')
  const marker = join(root, 'node_modules/.package-lock.json')
  if (existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs - 1000) return
  console.log('[setup] installing dependencies (npm ci)...')
  run('npm', ['ci', '--no-audit', '--no-fund'], { env: { ...process.env, NUXT_TELEMETRY_DISABLED: '1' } })
}

export function freePort() {
  return new Promise((resolve, reject) => {
    const s = createServer()
    s.unref()
    s.on('error', reject)
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address()
      s.close(() => resolve(port))
    })
  })
}

export function isPortFree(port) {
  return new Promise((resolve) => {
    const s = createServer()
    s.once('error', () => resolve(false))
    s.listen(port, '127.0.0.1', () => s.close(() => resolve(true)))
  })
}

export async function waitForHttp(url, timeoutMs = 30_000) {
  const until = Date.now() + timeoutMs
  while (Date.now() < until) {
    try {
      const res = await fetch(url)
      if (res.ok) return
    }
    catch { /* not up yet */ }
    await sleep(200)
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`)
}

/** Start a long-running child; it dies with us. */
export function background(cmd, args, opts = {}) {
  const child = spawn(cmd, args, { cwd: root, stdio: 'inherit', ...opts })
  const stop = () => {
    if (child.exitCode === null) child.kill('SIGTERM')
  }
  process.on('exit', stop)
  return child
}

export function nuxtBuild() {
  console.log('[setup] building the app (nuxt build)...')
  run(bin('nuxt'), ['build'], { env: { ...process.env, NUXT_TELEMETRY_DISABLED: '1', NODE_ENV: 'production' } })
}
