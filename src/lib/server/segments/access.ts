import { eq } from 'drizzle-orm';
import { apiCaller, apiError } from '../api';
import type { Principal } from '../auth/principal';
import { db } from '../db';
import { segments, type SegmentRow } from '../db/schema';
import { findSegment, patientCanSeeSegment } from './index';

/**
 * The caller and the segment a segment endpoint serves, or the JSON error to answer. Clinicians
 * reach their clinic's segments; a patient reaches a segment only through a published programme
 * of their own (patientCanSeeSegment), and only once it is cut. Every other id — another
 * clinic's, another patient's, one not in any programme — reads as not found.
 */
export function callerSegment(id: string): { caller: Principal; segment: SegmentRow } | Response {
	const caller = apiCaller('clinician', 'patient');
	if (caller instanceof Response) return caller;
	if (caller.role === 'clinician') {
		const segment = findSegment(caller.clinicId, id);
		return segment ? { caller, segment } : apiError(404, 'Not found.');
	}
	const segment = db().select().from(segments).where(eq(segments.id, id)).get();
	if (
		!segment ||
		segment.status !== 'ready' ||
		segment.clinicId !== caller.clinicId ||
		!caller.patientId ||
		!patientCanSeeSegment(caller.patientId, segment.id)
	) {
		return apiError(404, 'Not found.');
	}
	return { caller, segment };
}
