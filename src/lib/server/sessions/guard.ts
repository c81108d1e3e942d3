import { error } from '@sveltejs/kit';
import { apiCaller, apiError } from '../api';
import { requireRole } from '../auth/guard';
import type { Principal } from '../auth/principal';
import type { Patient } from '../db/schema/patients';
import { findPatientInClinic } from '../patients';

/**
 * The signed-in patient and their own record, for patient pages. The record comes from the
 * session, never from a URL, so no id in a request can reach another patient's record.
 */
export function requirePatient(): { principal: Principal; patient: Patient } {
	const principal = requireRole('patient');
	const patient = principal.patientId
		? findPatientInClinic(principal.clinicId, principal.patientId)
		: undefined;
	if (!patient) error(404, 'Your patient record was not found. Please contact your clinic.');
	return { principal, patient };
}

/** The same for endpoints: the caller's patient record, or the JSON error to return. */
export function apiPatient(): { principal: Principal; patient: Patient } | Response {
	const principal = apiCaller('patient');
	if (principal instanceof Response) return principal;
	const patient = principal.patientId
		? findPatientInClinic(principal.clinicId, principal.patientId)
		: undefined;
	if (!patient) return apiError(404, 'Your patient record was not found.');
	return { principal, patient };
}
