import { defineConfig } from 'drizzle-kit';

// Schema and migrations live in db/ (the store issue fills them in).
export default defineConfig({
  dialect: 'turso',
  schema: './db/schema.ts',
  out: './db/migrations',
  dbCredentials: {
    url: process.env.DATABASE_URL ?? 'file:data/epochwright.db',
    authToken: process.env.DATABASE_AUTH_TOKEN,
  },
});
