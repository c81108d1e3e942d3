import { error, fail } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireRole } from '$lib/server/auth/guard';
import { findPatientInClinic, updatePatientDetails } from '$lib/server/patients';
import {
	detailsDraftFrom,
	detailsFormFields,
	detailsFormOf,
	draftOfDetailsForm,
	parseDetails,
	withDetailChecks,
	type PatientDetails
} from '$lib/patients/form';
import type { Actions, PageServerLoad } from './$types';

const detailsForm = withDetailChecks(detailsFormFields);

/** The form holding a patient's stored details. */
const storedDetails = (patient: PatientDetails) =>
	superValidate(detailsFormOf(detailsDraftFrom(patient)), zod4(detailsForm), { errors: false });

export const load: PageServerLoad = async ({ params }) => {
	const clinician = requireRole('clinician');
	const patient = findPatientInClinic(clinician.clinicId, params.id);
	if (!patient) error(404, 'Not found.');
	return {
		patient: { id: patient.id, fullName: patient.fullName, email: patient.email },
		form: await storedDetails(patient)
	};
};

export const actions: Actions = {
	save: async ({ params, request }) => {
		const clinician = requireRole('clinician');
		const form = await superValidate(request, zod4(detailsForm));
		if (!form.valid) return fail(400, { form });
		const parsed = parseDetails(draftOfDetailsForm(form.data));
		// The form's checks are these very checks: a refusal here would be a fault of ours.
		if (!parsed.ok) throw new Error(`Checked patient details refused: ${parsed.message}`);
		const saved = updatePatientDetails(clinician, params.id, parsed.details);
		if (!saved) error(404, 'Not found.');
		// As stored: a precaution ticked and typed shows once.
		return { form: await storedDetails(saved), saved: true };
	}
};
