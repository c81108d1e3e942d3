/**
 * The published library as cards in memory: what lists, filters and search results show of each
 * exercise (a few hundred bytes each; 10,000 exercises are a few MB). Reading a list from it
 * costs no query; filtering and sorting 10,000 cards takes about a millisecond, where the same
 * join through SQLite took tens.
 *
 * It can never show what is no longer public: it is rebuilt whenever another connection has
 * committed anything since it was read (SQLite's `PRAGMA data_version`, checked on every use,
 * costs no I/O) and whenever this process changes what is published (`forgetCatalogue`, called
 * inside the same code that publishes, unpublishes and retires).
 */
import { byTitle } from '$lib/library/search';
import { db } from '../db';

export interface ExerciseCard {
	entryId: string;
	slug: string;
	versionId: string;
	title: string;
	bodyRegion: string;
	position: string;
	movementType: string;
	phase: number;
	equipment: string[];
	posterCount: number;
	durationSeconds: number | null;
	/**
	 * A matched excerpt (MARK_OPEN/MARK_CLOSE of lib/library/search around the words) or the
	 * description's start.
	 */
	excerpt: string;
}

export interface FilterOption<T extends string | number = string> {
	value: T;
	count: number;
}

export interface FilterOptions {
	regions: FilterOption[];
	positions: FilterOption[];
	movements: FilterOption[];
	phases: FilterOption<number>[];
	equipment: FilterOption[];
}

export interface Catalogue {
	byId: Map<string, ExerciseCard>;
	/** The card of each row of the search index, so ranking reads no stored text. */
	bySearchRow: Map<number, ExerciseCard>;
	/** Newest version first. */
	recent: ExerciseCard[];
	/** By title (lib/library/search byTitle), sorted once here rather than on every list. */
	byTitle: ExerciseCard[];
	options: FilterOptions;
}

interface CardRow extends Omit<ExerciseCard, 'equipment'> {
	equipment: string;
}

let cached: { client: unknown; dataVersion: number; value: Catalogue } | null = null;

/** Makes the next read rebuild the catalogue (this process changed what is published). */
export function forgetCatalogue(): void {
	cached = null;
}

function options<T extends string | number>(
	cards: ExerciseCard[],
	values: (c: ExerciseCard) => T[]
) {
	const counts = new Map<T, number>();
	for (const card of cards) {
		for (const value of new Set(values(card))) counts.set(value, (counts.get(value) ?? 0) + 1);
	}
	return [...counts.entries()]
		.map(([value, count]) => ({ value, count }))
		.sort((a, b) =>
			typeof a.value === 'number' && typeof b.value === 'number'
				? a.value - b.value
				: String(a.value).localeCompare(String(b.value), 'en', { sensitivity: 'base' })
		);
}

function build(): Catalogue {
	const rows = db()
		.$client.prepare<[], CardRow>(
			`SELECT e.id AS entryId, e.slug AS slug, v.id AS versionId, v.title AS title,
				v.body_region AS bodyRegion, v.position AS position, v.movement_type AS movementType,
				v.phase AS phase, v.equipment AS equipment, v.poster_count AS posterCount,
				v.clip_duration_seconds AS durationSeconds,
				substr(json_extract(v.snapshot, '$.description'), 1, 180) AS excerpt
			FROM library_exercise e JOIN library_version v ON v.id = e.current_version_id
			WHERE e.status = 'published'
			ORDER BY v.published_at DESC, e.slug`
		)
		.all();
	const recent = rows.map((r) => ({
		...r,
		equipment: JSON.parse(r.equipment) as string[],
		excerpt: r.excerpt ?? ''
	}));
	const byId = new Map(recent.map((c) => [c.entryId, c]));
	const bySearchRow = new Map<number, ExerciseCard>();
	for (const row of db()
		.$client.prepare<
			[],
			{ rowid: number; entryId: string }
		>('SELECT rowid, library_exercise_id AS entryId FROM library_search')
		.iterate()) {
		const card = byId.get(row.entryId);
		if (card) bySearchRow.set(row.rowid, card);
	}
	return {
		byId,
		bySearchRow,
		recent,
		byTitle: [...recent].sort(byTitle),
		options: {
			regions: options(recent, (c) => [c.bodyRegion]),
			positions: options(recent, (c) => [c.position]),
			movements: options(recent, (c) => [c.movementType]),
			phases: options(recent, (c) => [c.phase]),
			equipment: options(recent, (c) => c.equipment)
		}
	};
}

/** The catalogue as the database has it now. */
export function catalogue(): Catalogue {
	const client = db().$client;
	const dataVersion = client.pragma('data_version', { simple: true }) as number;
	if (cached && cached.client === client && cached.dataVersion === dataVersion) return cached.value;
	const value = build();
	cached = { client, dataVersion, value };
	return value;
}
