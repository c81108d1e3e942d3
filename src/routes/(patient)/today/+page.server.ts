import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { cliniciansOf, findPatientInClinic } from '$lib/server/patients';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = () => {
	const patient = requireRole('patient');
	// A patient only ever reads their own record: the id comes from the session, never the URL.
	const record = patient.patientId
		? findPatientInClinic(patient.clinicId, patient.patientId)
		: undefined;
	if (!record) error(404, 'Your patient record was not found. Please contact your clinic.');
	return {
		firstName: record.fullName.split(/\s+/)[0],
		clinicName: patient.clinicName,
		condition: record.condition,
		clinicians: cliniciansOf(record.id)
	};
};
