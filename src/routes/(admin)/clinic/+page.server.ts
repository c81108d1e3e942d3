import { fail } from '@sveltejs/kit';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { STAFF_ROLES } from '$lib/server/db/schema/clinics';
import { profiles } from '$lib/captions/checks';
import { requireRole } from '$lib/server/auth/guard';
import { isTimeZone } from '$lib/clinical/calendar';
import { COMMON_TIME_ZONES } from '$lib/patients/vocabulary';
import {
	getClinicCaptionProfile,
	getClinicTimeZone,
	setClinicCaptionProfile,
	setClinicTimeZone
} from '$lib/server/clinics';
import { normaliseEmail, sendInvitation } from '$lib/server/invitations';
import {
	changeRole,
	emailHasRoleIn,
	listMembers,
	listStaffInvitations,
	MemberError,
	removeMember,
	revokeInvitation
} from '$lib/server/members';
import type { Actions, PageServerLoad } from './$types';

/** The forms of a table, one a row, by row id; each form's id names its row. */
async function rowForms<Row, Form>(
	rows: Row[],
	key: (row: Row) => string,
	form: (row: Row) => Promise<Form>
): Promise<Record<string, Form>> {
	return Object.fromEntries(await Promise.all(rows.map(async (r) => [key(r), await form(r)])));
}

export const load: PageServerLoad = async () => {
	const admin = requireRole('admin');
	const members = listMembers(admin.clinicId);
	const invitations = listStaffInvitations(admin.clinicId);
	return {
		clinicName: admin.clinicName,
		selfId: admin.id,
		profileForm: await superValidate(
			{ profile: getClinicCaptionProfile(admin.clinicId) },
			zod4(profileForm),
			{ id: 'captionProfile', errors: false }
		),
		inviteForm: await superValidate({ email: '', role: 'clinician' }, zod4(inviteForm), {
			id: 'invite',
			errors: false
		}),
		timeZoneForm: await superValidate(
			{ timeZone: getClinicTimeZone(admin.clinicId) },
			zod4(timeZoneForm),
			{ id: 'timeZone', errors: false }
		),
		timeZones: COMMON_TIME_ZONES,
		captionProfiles: Object.values(profiles).map((p) => ({
			id: p.id,
			label: p.label,
			summary: `${p.maxCharsPerLine.value} characters a line, ${p.maxLines.value} lines, about ${p.targetWordsPerMinute.value} words a minute, at least ${p.minSeconds.value} s on screen`
		})),
		members,
		roleForms: await rowForms(
			members,
			(m) => m.membershipId,
			(m) =>
				superValidate({ membershipId: m.membershipId, role: m.role }, zod4(roleForm), {
					id: `role-${m.membershipId}`,
					errors: false
				})
		),
		removeForms: await rowForms(
			members,
			(m) => m.membershipId,
			(m) =>
				superValidate({ id: m.membershipId }, zod4(idForm), {
					id: `remove-${m.membershipId}`,
					errors: false
				})
		),
		revokeForms: await rowForms(
			invitations,
			(i) => i.id,
			(i) => superValidate({ id: i.id }, zod4(idForm), { id: `revoke-${i.id}`, errors: false })
		),
		invitations: invitations.map((i) => ({
			id: i.id,
			email: i.email,
			role: i.role,
			status: i.status,
			expiresAt: i.expiresAt.toISOString()
		}))
	};
};

const inviteForm = z.object({
	email: z.email('Enter a valid e-mail address.').max(320).transform(normaliseEmail),
	role: z.enum(STAFF_ROLES, 'Choose a role.')
});
const roleForm = z.object({ membershipId: z.uuid(), role: z.enum(STAFF_ROLES, 'Choose a role.') });
const idForm = z.object({ id: z.uuid() });
const profileForm = z.object({ profile: z.enum(['bbc', 'dcmp'], 'Choose a caption guideline.') });
const timeZoneForm = z.object({
	timeZone: z
		.string()
		.trim()
		.refine(isTimeZone, 'Choose a time zone from the list, e.g. Europe/London.')
});

/** A refusal that belongs to no row on the page (a row's id that is not one), said at its top. */
function failed(action: string, message: string, status = 400) {
	return fail(status, { action, message });
}

export const actions: Actions = {
	invite: async ({ request }) => {
		const admin = requireRole('admin');
		const form = await superValidate(request, zod4(inviteForm), { id: 'invite' });
		if (!form.valid) return fail(400, { form });
		if (emailHasRoleIn(form.data.email, admin.clinicId)) {
			return setError(form, 'email', 'That address already has an account in your clinic.', {
				status: 409
			});
		}
		const { mail } = await sendInvitation({
			clinicId: admin.clinicId,
			...form.data,
			invitedBy: admin
		});
		return { form, action: 'invite', sent: form.data.email, mail };
	},
	role: async ({ request }) => {
		const admin = requireRole('admin');
		const form = await superValidate(request, zod4(roleForm));
		if (form.errors.membershipId) return failed('role', 'Choose a member and a role.');
		// Without scripts no form id is posted: the row is the member's.
		form.id = `role-${form.data.membershipId}`;
		if (!form.valid) return fail(400, { form });
		try {
			changeRole(admin, form.data.membershipId, form.data.role);
		} catch (e) {
			if (e instanceof MemberError) return setError(form, 'role', e.message, { status: 409 });
			throw e;
		}
		return { form, action: 'role', saved: true };
	},
	remove: async ({ request }) => {
		const admin = requireRole('admin');
		const form = await superValidate(request, zod4(idForm));
		if (!form.valid) return failed('remove', 'Choose a member to remove.');
		form.id = `remove-${form.data.id}`;
		try {
			removeMember(admin, form.data.id);
		} catch (e) {
			if (e instanceof MemberError) return message(form, e.message, { status: 409 });
			throw e;
		}
		return { form, action: 'remove', saved: true };
	},
	captionProfile: async ({ request }) => {
		const admin = requireRole('admin');
		const form = await superValidate(request, zod4(profileForm), { id: 'captionProfile' });
		if (!form.valid) return fail(400, { form });
		setClinicCaptionProfile(admin.clinicId, form.data.profile);
		return { form, action: 'captionProfile', saved: true };
	},
	timeZone: async ({ request }) => {
		const admin = requireRole('admin');
		const form = await superValidate(request, zod4(timeZoneForm), { id: 'timeZone' });
		if (!form.valid) return fail(400, { form });
		setClinicTimeZone(admin.clinicId, form.data.timeZone);
		return { form, action: 'timeZone', saved: true };
	},
	revoke: async ({ request }) => {
		const admin = requireRole('admin');
		const form = await superValidate(request, zod4(idForm));
		if (!form.valid) return failed('revoke', 'Choose an invitation.');
		form.id = `revoke-${form.data.id}`;
		try {
			revokeInvitation(admin, form.data.id);
		} catch (e) {
			if (e instanceof MemberError) return message(form, e.message, { status: 409 });
			throw e;
		}
		return { form, action: 'revoke', saved: true };
	}
};
