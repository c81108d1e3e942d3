import { requireRole } from '$lib/server/auth/guard';
import { listMembers } from '$lib/server/members';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = () => {
	const educator = requireRole('educator');
	const members = listMembers(educator.clinicId);
	return {
		firstName: educator.name.split(/\s+/)[0],
		clinicName: educator.clinicName,
		clinicians: members.filter((m) => m.role === 'clinician').map((m) => m.name ?? m.email),
		educators: members.filter((m) => m.role === 'educator').map((m) => m.name ?? m.email)
	};
};
