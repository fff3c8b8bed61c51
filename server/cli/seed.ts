// `npm run db:seed` and npm start: loads the demo scenario once into DATABASE_URL.
import { createDatabase } from '../db/client';
import { seedDemo } from '../db/seed/seed';

const url = process.env.DATABASE_URL;
if (!url) throw new Error('DATABASE_URL is required');
const database = createDatabase(url, 2);
const result = await seedDemo(database.db);
await database.close();
console.log(result.seeded ? `[seed] demo scenario loaded: ${result.households} households` : '[seed] demo scenario already present');
