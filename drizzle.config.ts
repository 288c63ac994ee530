import { defineConfig } from 'drizzle-kit'

// `npm run db:generate` turns changes in server/db/schema/ into a new SQL file in drizzle/.
// Migrations are applied by scripts/db.mjs (as the owner role), never by the running server.
export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema/index.ts',
  out: './drizzle',
  casing: 'snake_case',
  dbCredentials: { url: process.env.NUXT_DATABASE_OWNER_URL ?? 'postgres://localhost/setwell' },
})
