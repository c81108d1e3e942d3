import { json } from '@sveltejs/kit';
import { apiCaller, apiError } from '$lib/server/api';
import { cliniciansOf, findPatientInClinic, patientAccess } from '$lib/server/patients';
import type { RequestHandler } from './$types';

export interface PatientProfile {
	id: string;
	fullName: string;
	email: string;
	affectedSide: string;
	condition: string;
	status: string;
	clinicians: string[];
}

/**
 * One patient's profile: for the patient themself, or for a clinician of the same clinic.
 * Anyone else gets 404, the same answer as for an id that does not exist.
 */
export const GET: RequestHandler = ({ params }) => {
	const user = apiCaller('patient', 'clinician');
	if (user instanceof Response) return user;
	if (user.role === 'patient' && user.patientId !== params.id) return apiError(404, 'Not found.');
	const patient = findPatientInClinic(user.clinicId, params.id);
	if (!patient) return apiError(404, 'Not found.');
	const profile: PatientProfile = {
		id: patient.id,
		fullName: patient.fullName,
		email: patient.email,
		affectedSide: patient.affectedSide,
		condition: patient.condition,
		status: patientAccess(patient).status,
		clinicians: cliniciansOf(patient.id)
	};
	return json(profile);
};
