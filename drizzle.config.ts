import { defineConfig } from 'drizzle-kit';

// drizzle-kit reads the tables from every feature folder and writes SQL migrations to drizzle/.
export default defineConfig({
  dialect: 'postgresql',
  schema: './server/**/*.table.ts',
  out: './drizzle',
  dbCredentials: { url: process.env.DATABASE_URL ?? 'postgres://meander@127.0.0.1:54329/meander' },
});
