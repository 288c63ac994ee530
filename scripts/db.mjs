// npm run db:start | db:stop | db:reset | db:migrate  (add --test for the test profile)
// npm run db:backup [-- FILE|DIR] [--database NAME] [--profile dev|test]
// npm run db:restore [-- FILE] [--database NAME] [--profile dev|test]   (FILE: default the newest dump)
import { profile } from './lib/env.mjs'
import { bootstrap, migrate, removeCluster, startCluster, stopCluster } from './lib/pg.mjs'
import { rmSync } from 'node:fs'
import { join } from 'node:path'
import { parseArgs } from 'node:util'

const [cmd] = process.argv.slice(2)
const p = profile(process.argv.includes('--test') ? 'test' : 'dev')

switch (cmd) {
  case 'start':
    await startCluster(p)
    await bootstrap(p)
    await migrate(p)
    break
  case 'migrate':
    await startCluster(p)
    await bootstrap(p)
    await migrate(p)
    break
  case 'stop':
    stopCluster(p)
    break
  case 'reset':
    // Start over: the cluster and its secrets go; the next `npm start` creates and seeds afresh.
    removeCluster(p)
    rmSync(join(p.dataDir, 'secrets.json'), { force: true })
    rmSync(join(p.dataDir, 'uploads'), { recursive: true, force: true })
    console.log('[db] removed the database; the next `npm start` creates and seeds a new one')
    break
  case 'backup':
  case 'restore': {
    // pg_dump -Fc of npm start's database (or the test profile's) and back: see scripts/backup.mjs
    const { values, positionals } = parseArgs({
      args: process.argv.slice(3),
      allowPositionals: true,
      options: {
        profile: { type: 'string', default: 'dev' },
        test: { type: 'boolean', default: false },
        database: { type: 'string' },
        snapshot: { type: 'string' },
      },
    })
    if (positionals.length > 1) {
      console.error(`[db] ${cmd} takes one path, not ${positionals.length}`)
      process.exit(2)
    }
    const target = profile(values.test ? 'test' : values.profile)
    const { backup, restore } = await import('./backup.mjs')
    try {
      if (cmd === 'backup') await backup(target, { out: positionals[0], database: values.database, snapshot: values.snapshot })
      else await restore(target, { file: positionals[0], database: values.database })
    }
    catch (err) {
      console.error(`[db] ${cmd} failed: ${err.message}`)
      process.exit(1)
    }
    break
  }
  default:
    console.error('usage: node scripts/db.mjs start|stop|reset|migrate [--test]\n       node scripts/db.mjs backup [FILE|DIR] | restore [FILE] [--database NAME] [--profile dev|test]')
    process.exit(2)
}
