import { error } from '@sveltejs/kit';
import {
	findTrack,
	firstCaptionsTrack,
	getVersion,
	listTracks,
	type CaptionTrack
} from '$lib/server/captions';
import { getClinicCaptionProfile } from '$lib/server/clinics';
import { requireOwnRecording } from '$lib/server/recordings/guard';
import type { PageServerLoad } from './$types';

/**
 * The caption studio for one track of a recording: `?track=<id>`, or the recording's first
 * captions track. Another clinic's recording or track, or a track of another recording, is 404.
 */
export const load: PageServerLoad = ({ params, url }) => {
	const { clinician, recording } = requireOwnRecording(params.id);
	const tracks = listTracks(clinician.clinicId, recording.id);
	const wanted = url.searchParams.get('track');
	let track: CaptionTrack | null;
	if (wanted !== null) {
		track = findTrack(clinician.clinicId, wanted);
		if (!track || track.recordingId !== recording.id) error(404, 'Not found.');
	} else {
		track =
			firstCaptionsTrack(clinician.clinicId, recording.id) ??
			(tracks[0] ? findTrack(clinician.clinicId, tracks[0].id) : null);
	}
	return {
		recording: {
			id: recording.id,
			title: recording.title,
			status: recording.status,
			durationSeconds: recording.durationSeconds,
			frameRate: recording.frameRate,
			sprite: recording.sprite,
			hasWaveform: recording.waveformKey !== null,
			posterCount: recording.posterCount,
			width: recording.width,
			height: recording.height
		},
		tracks: tracks.map((t) => ({ id: t.id, label: t.label, kind: t.kind, language: t.language })),
		track: track
			? {
					id: track.id,
					label: track.label,
					kind: track.kind,
					language: track.language,
					version: track.currentVersion,
					cues: getVersion(track)?.cues ?? []
				}
			: null,
		clinicProfile: getClinicCaptionProfile(clinician.clinicId)
	};
};
