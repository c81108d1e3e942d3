import { fail, redirect } from '@sveltejs/kit';
import { firstCaptionsTrack, listTracks } from '$lib/server/captions';
import { nudgeWorker } from '$lib/server/jobs';
import {
	cancelProcessing,
	deleteRecording,
	retryProcessing,
	statusView
} from '$lib/server/recordings';
import { requireOwnRecording } from '$lib/server/recordings/guard';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ params }) => {
	const { recording: r } = requireOwnRecording(params.id);
	const captions = firstCaptionsTrack(r.clinicId, r.id);
	return {
		captions: captions
			? {
					src: `/api/tracks/${captions.id}/captions.vtt`,
					language: captions.language,
					label: captions.label
				}
			: null,
		trackCount: listTracks(r.clinicId, r.id).length,
		recording: {
			id: r.id,
			title: r.title,
			originalFilename: r.originalFilename,
			contentType: r.contentType,
			sizeBytes: r.sizeBytes,
			durationSeconds: r.durationSeconds,
			width: r.width,
			height: r.height,
			videoCodec: r.videoCodec,
			audioCodec: r.audioCodec,
			frameRate: r.frameRate,
			rotation: r.rotation,
			renditionSize: r.renditionSize,
			posterCount: r.posterCount,
			hasSprite: r.sprite !== null,
			createdAt: r.createdAt.toISOString(),
			readyAt: r.readyAt?.toISOString() ?? null
		},
		status: statusView(r)
	};
};

export const actions: Actions = {
	retry: ({ params }) => {
		const { recording } = requireOwnRecording(params.id);
		if (!retryProcessing(recording)) {
			return fail(409, {
				message: 'Only a recording whose processing failed can be processed again.'
			});
		}
		nudgeWorker();
		return { retried: true };
	},
	cancel: ({ params }) => {
		const { recording } = requireOwnRecording(params.id);
		if (!cancelProcessing(recording)) {
			return fail(409, { message: 'There is no processing to cancel.' });
		}
		return { cancelled: true };
	},
	delete: async ({ params }) => {
		const { recording } = requireOwnRecording(params.id);
		await deleteRecording(recording);
		redirect(303, '/recordings?deleted=1');
	}
};
