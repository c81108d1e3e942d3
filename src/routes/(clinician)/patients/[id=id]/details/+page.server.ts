import { error, fail } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { findPatientInClinic, updatePatientDetails } from '$lib/server/patients';
import { detailsDraftFrom, detailsDraftFromForm, parseDetails } from '$lib/patients/form';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ params }) => {
	const clinician = requireRole('clinician');
	const patient = findPatientInClinic(clinician.clinicId, params.id);
	if (!patient) error(404, 'Not found.');
	return {
		patient: { id: patient.id, fullName: patient.fullName, email: patient.email },
		draft: detailsDraftFrom(patient)
	};
};

export const actions: Actions = {
	save: async ({ params, request }) => {
		const clinician = requireRole('clinician');
		const draft = detailsDraftFromForm(await request.formData());
		const parsed = parseDetails(draft);
		if (!parsed.ok) return fail(400, { message: parsed.message, path: parsed.path, draft });
		const saved = updatePatientDetails(clinician, params.id, parsed.details);
		if (!saved) error(404, 'Not found.');
		return { saved: true, draft: detailsDraftFrom(saved) };
	}
};
