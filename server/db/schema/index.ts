// The whole schema. Add a file per area and export it here; then `npm run db:generate`.
export * from './firms'
export * from './users'
export * from './team'
export * from './ledger'
export * from './visits'
export * from './quotes'
export * from './jobs'
export * from './invoices'
