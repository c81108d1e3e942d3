import { requireRole } from '$lib/server/auth/guard';
import { recordingListQuery, recordingListView } from '$lib/server/recordings/list-view';
import { listOpenUploads } from '$lib/server/recordings/uploads';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const clinician = requireRole('clinician');
	return {
		clinicName: clinician.clinicName,
		...recordingListView(clinician.clinicId, recordingListQuery(url.searchParams)),
		openUploads: await listOpenUploads(clinician)
	};
};
