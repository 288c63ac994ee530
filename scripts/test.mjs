// npm test: set up like npm start, but on a database of its own (fresh every run), then lint,
// typecheck, build once, and run the vitest projects unit, api, reliability and e2e against the build.
// Local shortcuts: --no-checks (skip lint and typecheck), --no-build (reuse .output),
// --project=unit (one project); anything after -- goes to vitest.
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs'
import { join } from 'node:path'
import { ensureDependencies } from './lib/run.mjs'

ensureDependencies()

const { profile, secrets, urls, root } = await import('./lib/env.mjs')
const { bootstrap, migrate, recreateDatabase, startCluster, stopCluster } = await import('./lib/pg.mjs')
const { bin, nuxtBuild, run } = await import('./lib/run.mjs')

const args = process.argv.slice(2)
const flag = name => args.includes(name)
const projectArg = args.find(a => a.startsWith('--project='))
const passthrough = args.includes('--') ? args.slice(args.indexOf('--') + 1) : []
const isRoot = process.getuid?.() === 0

function ensureChromium() {
  if (existsSync('/usr/bin/chromium')) return
  if (!isRoot) {
    console.error('[test] Chromium is missing for the browser tests: sudo apt-get install -y chromium')
    process.exit(1)
  }
  console.log('[test] installing Debian\'s chromium for the browser tests (apt-get)...')
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  run('apt-get', ['update', '-qq'], { env })
  run('apt-get', ['install', '-y', '-qq', 'chromium'], { env })
}

const p = profile('test')
let exitCode = 1
try {
  if (!projectArg || projectArg.includes('e2e')) ensureChromium()
  await startCluster(p)
  await recreateDatabase(p)
  await bootstrap(p)
  await migrate(p)
  const storageDir = join(p.dataDir, 'uploads')
  rmSync(storageDir, { recursive: true, force: true })
  // the demo's bank statement beside the test cluster, not over the one seeds/out/ keeps for npm start's database
  run(bin('tsx'), ['seeds/index.ts'], { env: { ...process.env, NUXT_DATABASE_OWNER_URL: urls(p).owner, NUXT_STORAGE_DIR: storageDir, SETWELL_DEMO_STATEMENT_PATH: join(p.dataDir, 'brackenridge-statement.csv') } })

  if (!flag('--no-checks')) {
    console.log('[test] lint')
    run(bin('eslint'), ['.'])
    console.log('[test] typecheck')
    run(bin('nuxt'), ['typecheck'], { env: { ...process.env, NUXT_TELEMETRY_DISABLED: '1' } })
  }
  if (!flag('--no-build') || !existsSync(join(root, process.env.SETWELL_OUTPUT_DIR ?? '.output', 'server/index.mjs'))) nuxtBuild()

  const artefacts = join(root, 'tests/artefacts')
  rmSync(artefacts, { recursive: true, force: true })
  mkdirSync(artefacts, { recursive: true })
  const report = join(artefacts, 'vitest.json')
  const s = secrets(p)
  const env = {
    ...process.env,
    NUXT_TELEMETRY_DISABLED: '1',
    SETWELL_TEST_DATABASE_URL: urls(p).app,
    SETWELL_TEST_OWNER_DATABASE_URL: urls(p).owner,
    SETWELL_TEST_SESSION_PASSWORD: s.sessionPassword,
    SETWELL_ARTEFACTS: artefacts,
    SETWELL_TEST_STORAGE_DIR: storageDir,
  }
  const projects = projectArg ? projectArg.slice('--project='.length).split(',') : ['unit', 'api', 'reliability', 'e2e']
  let failed = false
  try {
    run(bin('vitest'), ['run', ...projects.flatMap(x => ['--project', x]), '--reporter=default', '--reporter=json', `--outputFile.json=${report}`, ...passthrough], { env })
  }
  catch { failed = true }
  let passed = 0
  let failedCount = 0
  let skipped = 0
  if (existsSync(report)) {
    const r = JSON.parse(readFileSync(report, 'utf8'))
    passed = r.numPassedTests ?? 0
    failedCount = (r.numFailedTests ?? 0) + (failed && !r.numFailedTests ? 1 : 0)
    skipped = (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0)
  }
  else if (failed) failedCount = 1
  console.log(`\n${passed} passed, ${failedCount} failed${skipped ? `, ${skipped} skipped` : ''}`)
  exitCode = failed || failedCount ? 1 : 0
}
catch (err) {
  console.error(`[test] ${err.message}`)
  console.log('\n0 passed, 1 failed')
  exitCode = 1
}
finally {
  stopCluster(p)
}
process.exit(exitCode)
