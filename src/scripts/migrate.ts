/** Applies pending SQL migrations from drizzle/ to DATABASE_PATH (the app also does this at start). */
import { closeDatabase, db } from '../lib/server/db';
import { config } from '../lib/server/config';

db();
closeDatabase();
console.log(`Database ${config().DATABASE_PATH} is up to date.`);
