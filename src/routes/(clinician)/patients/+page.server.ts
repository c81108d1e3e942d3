import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { SIDES } from '$lib/server/db/schema/patients';
import { requireRole } from '$lib/server/auth/guard';
import { emailHasRole } from '$lib/server/members';
import { normaliseEmail } from '$lib/server/invitations';
import {
	invitePatient,
	listPatients,
	PatientError,
	resendPatientInvitation
} from '$lib/server/patients';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => {
	const clinician = requireRole('clinician');
	return {
		clinicName: clinician.clinicName,
		patients: listPatients(clinician.clinicId).map((p) => ({
			id: p.id,
			fullName: p.fullName,
			email: p.email,
			affectedSide: p.affectedSide,
			condition: p.condition,
			status: p.status,
			clinicians: p.clinicians,
			invitedAt: p.invitedAt?.toISOString() ?? null
		}))
	};
};

const inviteForm = z.object({
	fullName: z.string().trim().min(1, "Enter the patient's name.").max(120),
	email: z.email('Enter a valid e-mail address.').max(320).transform(normaliseEmail),
	affectedSide: z.enum(SIDES, 'Choose the affected side.'),
	condition: z.string().trim().max(200, 'Keep the condition under 200 characters.')
});

export const actions: Actions = {
	invite: async ({ request }) => {
		const clinician = requireRole('clinician');
		const raw = Object.fromEntries(await request.formData());
		const values = {
			fullName: String(raw.fullName ?? ''),
			email: String(raw.email ?? ''),
			affectedSide: String(raw.affectedSide ?? ''),
			condition: String(raw.condition ?? '')
		};
		const parsed = inviteForm.safeParse(values);
		if (!parsed.success)
			return fail(400, { action: 'invite', message: parsed.error.issues[0].message, values });
		if (emailHasRole(parsed.data.email)) {
			return fail(409, {
				action: 'invite',
				message: 'That address already has an account in a clinic.',
				values
			});
		}
		try {
			await invitePatient(clinician, parsed.data);
		} catch (e) {
			if (e instanceof PatientError)
				return fail(409, { action: 'invite', message: e.message, values });
			throw e;
		}
		return { action: 'invite', sent: parsed.data.email };
	},
	resend: async ({ request }) => {
		const clinician = requireRole('clinician');
		const parsed = z
			.object({ id: z.uuid() })
			.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return fail(400, { action: 'resend', message: 'Choose a patient.' });
		try {
			await resendPatientInvitation(clinician, parsed.data.id);
		} catch (e) {
			if (e instanceof PatientError) return fail(409, { action: 'resend', message: e.message });
			throw e;
		}
		return { action: 'resend', sent: 'the patient' };
	}
};
