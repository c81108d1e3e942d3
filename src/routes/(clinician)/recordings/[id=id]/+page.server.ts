import { fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { parseRecordingTitle } from '$lib/recordings/formats';
import {
	CaptionError,
	createTrack,
	firstCaptionsTrack,
	importIntoCaptions,
	listTracks
} from '$lib/server/captions';
import { nudgeWorker } from '$lib/server/jobs';
import {
	cancelProcessing,
	deleteRecording,
	renameRecording,
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
	/** Opens the caption editor on a recording with no track yet: its captions track is made first. */
	startCaptions: ({ params }) => {
		const { clinician, recording } = requireOwnRecording(params.id);
		if (recording.status !== 'ready') {
			return fail(409, { message: 'Captions can be written once the recording is ready.' });
		}
		const track =
			firstCaptionsTrack(clinician.clinicId, recording.id) ??
			createTrack(recording, { kind: 'captions', language: 'en-GB' });
		redirect(
			303,
			resolve(`/(clinician)/recordings/[id=id]/studio?track=${track.id}`, { id: recording.id })
		);
	},
	rename: async ({ params, request }) => {
		const { recording } = requireOwnRecording(params.id);
		const typed = String((await request.formData()).get('title') ?? '');
		const parsed = parseRecordingTitle(typed);
		if (!parsed.ok) return fail(400, { action: 'rename' as const, message: parsed.message, typed });
		renameRecording(recording, parsed.title);
		return { action: 'rename' as const, renamed: parsed.title };
	},
	/** A .vtt or .srt file straight into the captions track of its language (made when missing). */
	importCaptions: async ({ params, request }) => {
		const { clinician, recording } = requireOwnRecording(params.id);
		const form = await request.formData();
		const file = form.get('file');
		const language = String(form.get('language') ?? '').trim() || 'en-GB';
		if (!(file instanceof File) || file.size === 0) {
			return fail(400, {
				action: 'importCaptions' as const,
				message: 'Choose a .vtt or .srt file to import.',
				language
			});
		}
		try {
			const result = importIntoCaptions(recording, {
				language,
				bytes: new Uint8Array(await file.arrayBuffer()),
				filename: file.name,
				userId: clinician.id
			});
			if (!result.ok) {
				return fail('conflict' in result ? 409 : 422, {
					action: 'importCaptions' as const,
					message:
						'conflict' in result
							? 'Someone saved the captions at the same moment; import the file again.'
							: `${file.name} was not imported: ${result.message}`,
					language
				});
			}
			return {
				action: 'importCaptions' as const,
				imported: `${result.cueCount} cues imported from ${file.name} as version ${result.version}.`,
				warnings: result.warnings.length
			};
		} catch (problem) {
			if (problem instanceof CaptionError) {
				return fail(problem.status, {
					action: 'importCaptions' as const,
					message: problem.message,
					language
				});
			}
			throw problem;
		}
	},
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
		redirect(303, resolve('/recordings?deleted=1'));
	}
};
