import { ACCOUNTS, database, seedReadyRecording } from '../support';
import { clinicianApi, type MatrixPart } from './types';

/**
 * Drafts from the speech: clinicians of the track's clinic only. The matrix's own track has cues
 * (a draft is refused, 409); an empty track on a recording whose "rendition" is a few bytes gets
 * the sentence for unreadable sound (422); another clinic's track is not found.
 * speech-draft.e2e.ts makes a draft from real media.
 */
export const speechPart: MatrixPart = {
	async seed() {
		const recordingId = await seedReadyRecording(ACCOUNTS.clinician);
		const db = database();
		const emptyTrackId = crypto.randomUUID();
		try {
			const { clinicId } = db
				.prepare('select clinic_id as clinicId from recording where id = ?')
				.get(recordingId) as { clinicId: string };
			const now = Date.now();
			db.prepare(
				`insert into caption_track (id, recording_id, clinic_id, kind, language, label, current_version, created_at, updated_at)
				 values (?, ?, ?, 'captions', 'en-GB', 'Matrix empty', 0, ?, ?)`
			).run(emptyTrackId, recordingId, clinicId, now, now);
		} finally {
			db.close();
		}
		return { emptyTrackId };
	},
	rows: [
		{
			route: '/api/tracks/[id=id]/speech-draft',
			note: "own clinic's track that already has cues",
			path: (f) => `/api/tracks/${f.trackId}/speech-draft`,
			expect: clinicianApi(409)
		},
		{
			route: '/api/tracks/[id=id]/speech-draft',
			note: "own clinic's empty track, rendition unreadable",
			path: (f) => `/api/tracks/${f.extra.emptyTrackId}/speech-draft`,
			expect: clinicianApi(422)
		},
		{
			route: '/api/tracks/[id=id]/speech-draft',
			note: "another clinic's track",
			path: (f) => `/api/tracks/${f.otherClinicTrackId}/speech-draft`,
			expect: clinicianApi(404)
		}
	]
};
