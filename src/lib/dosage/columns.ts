/**
 * The six dosage columns, shared by an exercise's starting dosage and a programme item's own.
 * Pure Drizzle column definitions (no database driver), so the browser may load them too.
 */
// Relative imports only: drizzle-kit loads this through the schema, without SvelteKit's aliases.
import { integer } from 'drizzle-orm/sqlite-core';

export const dosageColumns = () => ({
	sets: integer('sets').notNull(),
	reps: integer('reps').notNull(),
	holdSeconds: integer('hold_seconds').notNull().default(0),
	restSeconds: integer('rest_seconds').notNull().default(0),
	sessionsPerDay: integer('sessions_per_day').notNull(),
	daysPerWeek: integer('days_per_week').notNull()
});
