import { fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
// superforms' fail takes the file out of a refused form, which cannot go back to the page.
import { fail as refuse, superValidate, withFiles } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { captionFile, languageTag } from '$lib/captions/track-form';
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

/** A recording's new title, read as parseRecordingTitle reads it (trimmed, spaces run together). */
const renameForm = z.object({
	title: z.string().transform((typed, ctx) => {
		const parsed = parseRecordingTitle(typed);
		if (parsed.ok) return parsed.title;
		ctx.addIssue({ code: 'custom', message: parsed.message });
		return z.NEVER;
	})
});

/** A caption file for the captions track of its language; a blank language is British English. */
const importCaptionsForm = z.object({ file: captionFile, language: languageTag });
const DEFAULT_LANGUAGE = 'en-GB';

export const load: PageServerLoad = async ({ params }) => {
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
		status: statusView(r),
		renameForm: await superValidate({ title: r.title }, zod4(renameForm), {
			id: 'rename',
			errors: false
		}),
		importCaptionsForm: await superValidate(
			{ language: DEFAULT_LANGUAGE },
			zod4(importCaptionsForm),
			{
				id: 'import-captions',
				errors: false
			}
		)
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
		const form = await superValidate(request, zod4(renameForm), { id: 'rename' });
		if (!form.valid) return fail(400, { form });
		renameRecording(recording, form.data.title);
		return { form, renamed: form.data.title };
	},
	/** A .vtt or .srt file straight into the captions track of its language (made when missing). */
	importCaptions: async ({ params, request }) => {
		const { clinician, recording } = requireOwnRecording(params.id);
		const form = await superValidate(request, zod4(importCaptionsForm), { id: 'import-captions' });
		if (!form.valid) return refuse(400, { form });
		const { file } = form.data;
		try {
			const result = importIntoCaptions(recording, {
				language: form.data.language || DEFAULT_LANGUAGE,
				bytes: new Uint8Array(await file.arrayBuffer()),
				filename: file.name,
				userId: clinician.id
			});
			if (!result.ok) {
				if ('conflict' in result) {
					form.message = 'Someone saved the captions at the same moment; import the file again.';
					return refuse(409, { form });
				}
				// What is wrong with the file goes on its field.
				form.errors.file = [`${file.name} was not imported: ${result.message}`];
				return refuse(422, { form });
			}
			return withFiles({
				form,
				imported: `${result.cueCount} cues imported from ${file.name} as version ${result.version}.`,
				warnings: result.warnings.length
			});
		} catch (problem) {
			if (problem instanceof CaptionError) {
				form.message = problem.message;
				return refuse(problem.status, { form });
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
