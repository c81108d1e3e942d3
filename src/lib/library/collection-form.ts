/**
 * A collection's title and introduction as the library desk's forms take them: one schema for
 * the new collection form (its title) and a collection's own page (both).
 */
import { z } from 'zod';

export const collectionDetails = z.object({
	title: z
		.string()
		.trim()
		.min(3, 'Give the collection a title of at least 3 characters.')
		.max(120, 'Keep the title under 120 characters.'),
	introduction: z.string().max(6000, 'Keep the introduction under 6,000 characters.')
});
