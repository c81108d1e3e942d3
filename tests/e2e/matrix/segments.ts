import { ACCOUNTS, database, seedCaptionTrack, seedReadyRecording } from '../support';
import { seedReadySegment } from '../segments-support';
import { clinicianApi, MEDIA_OK, onlyPage, type MatrixPart, type Row } from './types';

/**
 * Segments: the clinician's segments page and its endpoints, and the segment files that patients
 * also reach. The matrix's patient has no programme using these segments, so every segment row
 * answers them 404, as for any id that is not theirs; segments.e2e.ts signs in a patient whose
 * published programme does use one and checks the 200s.
 */

/** Clinicians of the clinic; the patient gets "not found" (no programme of theirs uses it). */
const segmentFile = (clinician: number) => ({ ...clinicianApi(clinician), patient: 404 });

const segmentRows = (route: string, file: (id: string) => string, own: number = 200): Row[] => [
	{
		route,
		note: "own clinic's segment, in no programme of the patient's",
		path: (f) => file(f.extra.segmentId),
		expect: segmentFile(own)
	},
	{
		route,
		note: "another clinic's segment",
		path: (f) => file(f.extra.otherClinicSegmentId),
		expect: segmentFile(404)
	}
];

export const segmentsPart: MatrixPart = {
	async seed(f) {
		const segmentId = await seedReadySegment(f.recordingId, { title: 'Matrix heel slides' });
		const otherClinicSegmentId = await seedReadySegment(f.otherClinicRecordingId, {
			title: 'Matrix ankle pumps'
		});
		const cuttingSegmentId = await seedReadySegment(f.recordingId, {
			title: 'Matrix still cutting',
			status: 'cutting'
		});
		const chaptersRecordingId = await seedReadyRecording(ACCOUNTS.clinician);
		seedCaptionTrack(
			chaptersRecordingId,
			[{ id: 'chapter-1', start: 0, end: 1, text: 'Heel slides' }],
			{ kind: 'chapters', language: 'en-GB' }
		);
		// The matrix recording's sound and picture as already measured (its "rendition" is a few
		// bytes): its suggestions answer at once. The settings are signalSettings()'s defaults.
		const db = database();
		try {
			db.prepare(
				`insert into recording_signals (recording_id, rendition_ready_at, settings, silences, scene_changes, detected_at)
				 select id, ready_at, 'silence -45 dB 1.5 s; scene 0.3', '[]', '[]', ? from recording where id = ?`
			).run(Date.now(), f.recordingId);
		} finally {
			db.close();
		}
		// Never measured: asking queues the detection job, and the answer is 202 "working".
		const unmeasuredRecordingId = await seedReadyRecording(ACCOUNTS.clinician);
		return {
			segmentId,
			otherClinicSegmentId,
			cuttingSegmentId,
			chaptersRecordingId,
			unmeasuredRecordingId
		};
	},
	rows: [
		{
			route: '/(clinician)/recordings/[id=id]/segments',
			note: "own clinic's recording",
			path: (f) => `/recordings/${f.recordingId}/segments`,
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/recordings/[id=id]/segments',
			note: "another clinic's recording",
			path: (f) => `/recordings/${f.otherClinicRecordingId}/segments`,
			expect: { ...onlyPage('clinician'), clinician: 404 }
		},
		{
			route: '/(clinician)/recordings/[id=id]/exercises',
			note: "own clinic's recording: exercises from its segments",
			path: (f) => `/recordings/${f.recordingId}/exercises`,
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/recordings/[id=id]/exercises',
			note: "another clinic's recording",
			path: (f) => `/recordings/${f.otherClinicRecordingId}/exercises`,
			expect: { ...onlyPage('clinician'), clinician: 404 }
		},
		{
			route: '/api/recordings/[id=id]/segments',
			note: "own clinic's recording",
			path: (f) => `/api/recordings/${f.recordingId}/segments`,
			expect: clinicianApi(200)
		},
		{
			route: '/api/recordings/[id=id]/segments',
			note: "another clinic's recording",
			path: (f) => `/api/recordings/${f.otherClinicRecordingId}/segments`,
			expect: clinicianApi(404)
		},
		{
			route: '/api/recordings/[id=id]/segment-suggestions',
			note: "own clinic's recording, its sound and picture measured",
			path: (f) => `/api/recordings/${f.recordingId}/segment-suggestions`,
			expect: clinicianApi(200)
		},
		{
			route: '/api/recordings/[id=id]/segment-suggestions',
			note: "own clinic's recording not measured yet (the detection job is queued)",
			path: (f) => `/api/recordings/${f.extra.unmeasuredRecordingId}/segment-suggestions`,
			expect: clinicianApi(202)
		},
		{
			route: '/api/recordings/[id=id]/segment-suggestions',
			note: "another clinic's recording",
			path: (f) => `/api/recordings/${f.otherClinicRecordingId}/segment-suggestions`,
			expect: clinicianApi(404)
		},
		{
			route: '/api/recordings/[id=id]/chapters.vtt',
			note: "own clinic's recording with chapters",
			path: (f) => `/api/recordings/${f.extra.chaptersRecordingId}/chapters.vtt`,
			expect: clinicianApi(200)
		},
		{
			route: '/api/recordings/[id=id]/chapters.vtt',
			note: "own clinic's recording without chapters",
			path: (f) => `/api/recordings/${f.recordingId}/chapters.vtt`,
			expect: clinicianApi(404)
		},
		{
			route: '/api/recordings/[id=id]/chapters.vtt',
			note: "another clinic's recording",
			path: (f) => `/api/recordings/${f.otherClinicRecordingId}/chapters.vtt`,
			expect: clinicianApi(404)
		},
		...segmentRows(
			'/api/segments/[id=id]/clip.mp4',
			(id) => `/api/segments/${id}/clip.mp4`,
			MEDIA_OK
		),
		{
			route: '/api/segments/[id=id]/clip.mp4',
			note: 'a segment still being cut',
			path: (f) => `/api/segments/${f.extra.cuttingSegmentId}/clip.mp4`,
			expect: segmentFile(404)
		},
		{
			route: '/api/segments/[id=id]/clip.mp4',
			note: 'an id that is no segment',
			path: () => `/api/segments/${crypto.randomUUID()}/clip.mp4`,
			expect: segmentFile(404)
		},
		...segmentRows(
			'/api/segments/[id=id]/poster-[n].jpg',
			(id) => `/api/segments/${id}/poster-0.jpg`,
			MEDIA_OK
		),
		{
			route: '/api/segments/[id=id]/poster-[n].jpg',
			note: 'a poster the segment does not have',
			path: (f) => `/api/segments/${f.extra.segmentId}/poster-5.jpg`,
			expect: segmentFile(404)
		},
		...segmentRows(
			'/api/segments/[id=id]/captions.vtt',
			(id) => `/api/segments/${id}/captions.vtt`
		),
		...segmentRows(
			'/api/segments/[id=id]/transcript.json',
			(id) => `/api/segments/${id}/transcript.json`
		)
	]
};
