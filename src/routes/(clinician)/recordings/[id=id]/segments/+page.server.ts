import { fail } from '@sveltejs/kit';
import { nudgeWorker } from '$lib/server/jobs';
import { requireOwnRecording } from '$lib/server/recordings/guard';
import { currentCaptions, recordingSegments, retrySegment } from '$lib/server/segments';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ params }) => {
	const { recording: r } = requireOwnRecording(params.id);
	const captions = currentCaptions(r);
	const media = `/api/recordings/${r.id}/media`;
	return {
		recording: {
			id: r.id,
			title: r.title,
			status: r.status,
			durationSeconds: r.durationSeconds,
			width: r.width,
			height: r.height,
			frameRate: r.frameRate,
			hasAudio: r.hasAudio
		},
		media: {
			rendition: `${media}/rendition.mp4`,
			poster: r.posterCount > 0 ? `${media}/poster-0.jpg` : null,
			sprite: r.sprite ? { src: `${media}/sprite.jpg`, ...r.sprite } : null,
			waveform: r.waveformKey ? `${media}/waveform.json` : null
		},
		captions: captions.track
			? {
					src: `/api/tracks/${captions.track.id}/captions.vtt`,
					language: captions.track.language,
					label: captions.track.label,
					version: captions.version,
					cueCount: captions.cues.length
				}
			: null,
		confirmed: recordingSegments(r)
	};
};

export const actions: Actions = {
	retry: async ({ params, request }) => {
		const { clinician } = requireOwnRecording(params.id);
		const segmentId = String((await request.formData()).get('segment') ?? '');
		if (!retrySegment(clinician.clinicId, segmentId)) {
			return fail(409, { message: 'Only a segment whose cutting failed can be cut again.' });
		}
		nudgeWorker();
		return { retried: segmentId };
	}
};
