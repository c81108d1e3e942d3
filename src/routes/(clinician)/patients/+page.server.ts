import type { Delivery } from '$lib/server/mail';
import { fail } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { requireRole } from '$lib/server/auth/guard';
import { emailAddress } from '$lib/server/auth/credentials';
import { emailHasRoleIn } from '$lib/server/members';
import {
	invitePatient,
	listPatients,
	PatientError,
	resendPatientInvitation
} from '$lib/server/patients';
import {
	detailsFormFields,
	detailsFormOf,
	draftOfDetailsForm,
	emptyDetailsDraft,
	parseDetails,
	withDetailChecks
} from '$lib/patients/form';
import type { Actions, PageServerLoad } from './$types';

/** A new patient's details and the address their invitation goes to. */
const inviteForm = withDetailChecks(detailsFormFields.extend({ email: emailAddress }));

/** The invitation form as it first shows: empty, in the clinician's time zone. */
const blankInvitation = (timeZone: string) =>
	superValidate({ ...detailsFormOf(emptyDetailsDraft(timeZone)), email: '' }, zod4(inviteForm), {
		id: 'invite',
		errors: false
	});

export const load: PageServerLoad = async () => {
	const clinician = requireRole('clinician');
	return {
		clinicName: clinician.clinicName,
		inviteForm: await blankInvitation(clinician.timeZone),
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

export const actions: Actions = {
	invite: async ({ request }) => {
		const clinician = requireRole('clinician');
		const form = await superValidate(request, zod4(inviteForm), { id: 'invite' });
		if (!form.valid) return fail(400, { form });
		const { email } = form.data;
		if (emailHasRoleIn(email, clinician.clinicId)) {
			return setError(form, 'email', 'That address already has an account in your clinic.', {
				status: 409
			});
		}
		const parsed = parseDetails(draftOfDetailsForm(form.data));
		// The form's checks are these very checks: a refusal here would be a fault of ours.
		if (!parsed.ok) throw new Error(`Checked patient details refused: ${parsed.message}`);
		let mail: Delivery['status'];
		try {
			({ invitationMail: mail } = await invitePatient(clinician, { ...parsed.details, email }));
		} catch (e) {
			if (e instanceof PatientError) return setError(form, 'email', e.message, { status: 409 });
			throw e;
		}
		// Sent: the form starts empty for the next patient, with scripts or without.
		return { form: await blankInvitation(clinician.timeZone), action: 'invite', sent: email, mail };
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
