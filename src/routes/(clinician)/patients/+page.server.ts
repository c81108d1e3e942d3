import type { Delivery } from '$lib/server/mail';
import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole } from '$lib/server/auth/guard';
import { emailHasRoleIn } from '$lib/server/members';
import { normaliseEmail } from '$lib/server/invitations';
import {
	invitePatient,
	listPatients,
	PatientError,
	resendPatientInvitation
} from '$lib/server/patients';
import { detailsDraftFromForm, emptyDetailsDraft, parseDetails } from '$lib/patients/form';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => {
	const clinician = requireRole('clinician');
	return {
		clinicName: clinician.clinicName,
		blank: emptyDetailsDraft(clinician.timeZone),
		patients: listPatients(clinician.clinicId).map((p) => ({
			id: p.id,
			fullName: p.fullName,
			email: p.email,
			affectedSide: p.affectedSide,
			condition: p.condition,
			operationDate: p.operationDate,
			status: p.status,
			clinicians: p.clinicians,
			invitedAt: p.invitedAt?.toISOString() ?? null
		}))
	};
};

const emailField = z.email('Enter a valid e-mail address.').max(320).transform(normaliseEmail);

export const actions: Actions = {
	invite: async ({ request }) => {
		const clinician = requireRole('clinician');
		const form = await request.formData();
		const details = detailsDraftFromForm(form);
		const email = String(form.get('email') ?? '');
		const values = { ...details, email };
		const parsedEmail = emailField.safeParse(email);
		if (!parsedEmail.success)
			return fail(400, {
				action: 'invite',
				message: parsedEmail.error.issues[0].message,
				path: 'email',
				values
			});
		const parsed = parseDetails(details);
		if (!parsed.ok)
			return fail(400, { action: 'invite', message: parsed.message, path: parsed.path, values });
		if (emailHasRoleIn(parsedEmail.data, clinician.clinicId)) {
			return fail(409, {
				action: 'invite',
				message: 'That address already has an account in your clinic.',
				path: 'email',
				values
			});
		}
		let mail: Delivery['status'];
		try {
			({ invitationMail: mail } = await invitePatient(clinician, {
				...parsed.details,
				email: parsedEmail.data
			}));
		} catch (e) {
			if (e instanceof PatientError)
				return fail(409, { action: 'invite', message: e.message, path: 'email', values });
			throw e;
		}
		return { action: 'invite', sent: parsedEmail.data, mail };
	},
	resend: async ({ request }) => {
		const clinician = requireRole('clinician');
		const parsed = z
			.object({ id: z.uuid() })
			.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return fail(400, { action: 'resend', message: 'Choose a patient.' });
		let mail: Delivery['status'];
		try {
			mail = await resendPatientInvitation(clinician, parsed.data.id);
		} catch (e) {
			if (e instanceof PatientError) return fail(409, { action: 'resend', message: e.message });
			throw e;
		}
		return { action: 'resend', sent: 'the patient', mail };
	}
};
