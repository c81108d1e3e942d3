import { integer, text } from 'drizzle-orm/sqlite-core';

/** A text primary key filled with a random UUID (the `id` param matcher expects that shape). */
export const uuidPrimaryKey = () =>
	text('id')
		.primaryKey()
		.$defaultFn(() => crypto.randomUUID());

/** A millisecond timestamp set to now when the row is written, e.g. `created_at`. */
export const timestampNow = (name: string) =>
	integer(name, { mode: 'timestamp_ms' })
		.notNull()
		.$defaultFn(() => new Date());
