import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { cliniciansOf, findPatientInClinic, patientAccess } from '$lib/server/patients';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ params }) => {
	const clinician = requireRole('clinician');
	// Scoped by clinic in the query: another clinic's patient is simply not found.
	const patient = findPatientInClinic(clinician.clinicId, params.id);
	if (!patient) error(404, 'No patient with that link in your clinic.');
	const access = patientAccess(patient);
	return {
		patient: {
			id: patient.id,
			fullName: patient.fullName,
			email: patient.email,
			affectedSide: patient.affectedSide,
			condition: patient.condition,
			addedAt: patient.createdAt.toISOString()
		},
		status: access.status,
		clinicians: cliniciansOf(patient.id)
	};
};
