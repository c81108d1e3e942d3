import { error } from '@sveltejs/kit';
import { requireRole, requireSameClinic } from '../auth/guard';
import type { Principal } from '../auth/principal';
import type { Recording } from '../db/schema';
import { findRecording } from './index';

/**
 * The signed-in clinician and one recording of their clinic, for the recording's pages; any other
 * id (another clinic's included) is a 404. Kept apart from index.ts because it needs the request
 * (`$app/server`), which the stand-alone worker process does not have.
 */
export function requireOwnRecording(id: string): { clinician: Principal; recording: Recording } {
	const clinician = requireRole('clinician');
	const recording = findRecording(clinician.clinicId, id);
	if (!recording) error(404, 'Not found.');
	requireSameClinic(clinician, recording.clinicId);
	return { clinician, recording };
}
