/**
 * Applies pending SQL migrations from drizzle/ to DATABASE_PATH. The app and the worker also
 * migrate when they open the database, under an exclusive lock, so processes started together
 * never collide; running this first, before any of them, keeps their starts short.
 */
import { closeDatabase, db } from '../lib/server/db';
import { config } from '../lib/server/config';

db();
closeDatabase();
console.log(`Database ${config().DATABASE_PATH} is up to date.`);
