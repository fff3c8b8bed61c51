// `npm run db:migrate` and npm start: runs pending migrations on DATABASE_URL.
import { runMigrations } from '../db/migrate';

const url = process.env.DATABASE_URL;
if (!url) throw new Error('DATABASE_URL is required');
await runMigrations(url);
console.log('[migrate] database is up to date');
