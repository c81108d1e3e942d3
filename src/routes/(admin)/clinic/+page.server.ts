import { fail } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
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

export const load: PageServerLoad = async () => {
	const admin = requireRole('admin');
	return {
		clinicName: admin.clinicName,
		selfId: admin.id,
		captionProfile: getClinicCaptionProfile(admin.clinicId),
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
		members: listMembers(admin.clinicId),
		invitations: listStaffInvitations(admin.clinicId).map((i) => ({
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
const roleForm = z.object({ membershipId: z.uuid(), role: z.enum(STAFF_ROLES) });
const idForm = z.object({ id: z.uuid() });
const profileForm = z.object({ profile: z.enum(['bbc', 'dcmp'], 'Choose a caption guideline.') });
const timeZoneForm = z.object({
	timeZone: z
		.string()
		.trim()
		.refine(isTimeZone, 'Choose a time zone from the list, e.g. Europe/London.')
});

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
		const parsed = roleForm.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return failed('role', 'Choose a member and a role.');
		try {
			changeRole(admin, parsed.data.membershipId, parsed.data.role);
		} catch (e) {
			if (e instanceof MemberError) return failed('role', e.message, 409);
			throw e;
		}
		return { action: 'role', saved: true };
	},
	remove: async ({ request }) => {
		const admin = requireRole('admin');
		const parsed = idForm.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return failed('remove', 'Choose a member to remove.');
		try {
			removeMember(admin, parsed.data.id);
		} catch (e) {
			if (e instanceof MemberError) return failed('remove', e.message, 409);
			throw e;
		}
		return { action: 'remove', saved: true };
	},
	captionProfile: async ({ request }) => {
		const admin = requireRole('admin');
		const parsed = profileForm.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return failed('captionProfile', parsed.error.issues[0].message);
		setClinicCaptionProfile(admin.clinicId, parsed.data.profile);
		return { action: 'captionProfile', saved: true };
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
		const parsed = idForm.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return failed('revoke', 'Choose an invitation.');
		try {
			revokeInvitation(admin, parsed.data.id);
		} catch (e) {
			if (e instanceof MemberError) return failed('revoke', e.message, 409);
			throw e;
		}
		return { action: 'revoke', saved: true };
	}
};
