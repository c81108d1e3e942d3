import { z } from 'zod';
import { requireRole } from '$lib/server/auth/guard';
import { exerciseFacets, listExercises } from '$lib/server/exercises';
import {
	EXERCISE_STATUSES,
	MOVEMENT_TYPES,
	PHASE_NUMBERS,
	POSITIONS
} from '$lib/exercises/vocabulary';
import { describeDosage } from '$lib/dosage';
import type { PageServerLoad } from './$types';

// Anything unreadable in the address falls back to "any" rather than failing the page.
const query = z.object({
	q: z.string().trim().max(100).catch(''),
	status: z.enum([...EXERCISE_STATUSES, 'all']).catch('all'),
	region: z.string().trim().max(60).catch(''),
	position: z.enum([...POSITIONS, 'all']).catch('all'),
	movement: z.enum([...MOVEMENT_TYPES, 'all']).catch('all'),
	phase: z.coerce.number().int().min(1).max(PHASE_NUMBERS.length).nullable().catch(null),
	equipment: z.string().trim().max(40).catch('')
});

export const load: PageServerLoad = ({ url }) => {
	const clinician = requireRole('clinician');
	const get = (name: string) => url.searchParams.get(name) ?? undefined;
	const params = query.parse({
		q: get('q') ?? '',
		status: get('status'),
		region: get('region') ?? '',
		position: get('position'),
		movement: get('movement'),
		phase: get('phase') || null,
		equipment: get('equipment') ?? ''
	});
	const rows = listExercises(clinician.clinicId, {
		search: params.q,
		status: params.status,
		region: params.region,
		position: params.position,
		movementType: params.movement,
		phase: params.phase,
		equipment: params.equipment
	});
	return {
		clinicName: clinician.clinicName,
		query: params,
		facets: exerciseFacets(clinician.clinicId),
		exercises: rows.map((e) => ({
			id: e.id,
			title: e.title,
			bodyRegion: e.bodyRegion,
			position: e.position,
			movementType: e.movementType,
			phase: e.phase,
			equipment: e.equipment,
			status: e.status,
			dosage: describeDosage(e),
			posterUrl: e.segment?.posterUrl ?? null
		}))
	};
};
