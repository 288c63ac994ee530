// npm run db:start | db:stop | db:reset | db:migrate  (add --test for the test profile)
import { profile } from './lib/env.mjs'
import { bootstrap, migrate, removeCluster, startCluster, stopCluster } from './lib/pg.mjs'
import { rmSync } from 'node:fs'
import { join } from 'node:path'

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
  default:
    console.error('usage: node scripts/db.mjs start|stop|reset|migrate [--test]')
    process.exit(2)
}
