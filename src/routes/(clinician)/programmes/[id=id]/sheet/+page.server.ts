import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { findProgramme } from '$lib/server/programmes';
import { programmeSheet } from '$lib/server/programmes/sheet';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const clinician = requireRole('clinician');
	const view = findProgramme(clinician.clinicId, params.id);
	if (!view) error(404, 'Not found.');
	return {
		programmeId: view.programme.id,
		clinicName: clinician.clinicName,
		clinicianName: clinician.name,
		sheet: await programmeSheet(view)
	};
};
