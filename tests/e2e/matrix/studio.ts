import { onlyPage, type MatrixPart } from './types';

/** The caption studio: a clinician's own recording and track only; anyone else's is not found. */
export const studio: MatrixPart = {
	rows: [
		{
			route: '/(clinician)/recordings/[id=id]/studio',
			note: "own clinic's recording, its first captions track",
			path: (f) => `/recordings/${f.recordingId}/studio`,
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/recordings/[id=id]/studio',
			note: "own clinic's recording and track",
			path: (f) => `/recordings/${f.recordingId}/studio?track=${f.trackId}`,
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/recordings/[id=id]/studio',
			note: "another clinic's recording",
			path: (f) => `/recordings/${f.otherClinicRecordingId}/studio`,
			expect: { ...onlyPage('clinician'), clinician: 404 }
		},
		{
			route: '/(clinician)/recordings/[id=id]/studio',
			note: "own recording with another clinic's track",
			path: (f) => `/recordings/${f.recordingId}/studio?track=${f.otherClinicTrackId}`,
			expect: { ...onlyPage('clinician'), clinician: 404 }
		}
	]
};
