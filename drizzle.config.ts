// drizzle-kit settings: `npm run db:generate` writes SQL migrations from the schema into drizzle/
// (committed); scripts/migrate.ts applies them. Commands that talk to a database use DATABASE_URL.
import { defineConfig } from 'drizzle-kit';

export default defineConfig({
	dialect: 'postgresql',
	schema: './src/lib/server/db/schema.ts',
	out: './drizzle',
	casing: 'snake_case',
	dbCredentials: { url: process.env.DATABASE_URL ?? '' },
	strict: true,
	verbose: true
});
