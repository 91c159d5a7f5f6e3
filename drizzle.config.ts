import { defineConfig } from 'drizzle-kit';
import { fileURLToPath } from 'node:url';
import { relative } from 'node:path';

// drizzle-kit resolves paths against the working directory, and `out` must stay relative.
const rel = (p: string) => relative(process.cwd(), fileURLToPath(new URL(p, import.meta.url))) || '.';

export default defineConfig({
  dialect: 'postgresql',
  schema: rel('./packages/db/src/schema/index.ts'),
  out: rel('./packages/db/migrations'),
  casing: 'snake_case',
  dbCredentials: { url: process.env.DATABASE_URL ?? 'postgres://postgres@127.0.0.1:54329/plumbline' },
  strict: true,
  verbose: true,
});
