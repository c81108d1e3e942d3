import { json } from '@sveltejs/kit';
import { apiCaller, apiError } from '$lib/server/api';
import { listMembers } from '$lib/server/members';
import type { RequestHandler } from './$types';

export interface MemberRow {
	membershipId: string;
	name: string | null;
	email: string;
	role: string;
	joinedAt: string;
}

/** A clinic's members, for that clinic's admins only; other clinics get 404. */
export const GET: RequestHandler = ({ params }) => {
	const admin = apiCaller('admin');
	if (admin instanceof Response) return admin;
	if (admin.clinicId !== params.id) return apiError(404, 'Not found.');
	const members: MemberRow[] = listMembers(admin.clinicId).map((m) => ({
		membershipId: m.membershipId,
		name: m.name,
		email: m.email,
		role: m.role,
		joinedAt: m.joinedAt.toISOString()
	}));
	return json(members);
};
