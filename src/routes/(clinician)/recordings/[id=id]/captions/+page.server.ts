import { error, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { fail, message, superValidate, withFiles } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { checkCues, profiles } from '$lib/captions/checks';
import { diffCues } from '$lib/captions/diff';
import { captionFile, trackDetails } from '$lib/captions/track-form';
import {
	CaptionError,
	createTrack,
	findTrack,
	getVersion,
	importFile,
	listTracks,
	listVersions,
	restoreVersion
} from '$lib/server/captions';
import { getClinicCaptionProfile } from '$lib/server/clinics';
import { requireOwnRecording } from '$lib/server/recordings/guard';
import type { Actions, PageServerLoad } from './$types';

function ownTrack(clinicId: string, recordingId: string, trackId: unknown) {
	const track = typeof trackId === 'string' ? findTrack(clinicId, trackId) : null;
	if (!track || track.recordingId !== recordingId) error(404, 'Not found.');
	return track;
}

// The studio is where findings get fixed; this page only shows enough to know where to start.
const MAX_FINDINGS_SHOWN = 30;

export const load: PageServerLoad = async ({ params, url }) => {
	const { clinician, recording } = requireOwnRecording(params.id);
	const profile = profiles[getClinicCaptionProfile(clinician.clinicId)];
	const tracks = listTracks(clinician.clinicId, recording.id).map((summary) => {
		const track = findTrack(clinician.clinicId, summary.id)!;
		const findings = checkCues(getVersion(track)?.cues ?? [], profile);
		return {
			...summary,
			errors: findings.filter((f) => f.severity === 'error').length,
			warnings: findings.filter((f) => f.severity === 'warning').length
		};
	});
	const wanted = url.searchParams.get('track');
	const selected = tracks.find((t) => t.id === wanted) ?? tracks[0] ?? null;
	const track = selected ? findTrack(clinician.clinicId, selected.id) : null;
	const cues = track ? (getVersion(track)?.cues ?? []) : [];
	const findings = checkCues(cues, profile)
		.slice(0, MAX_FINDINGS_SHOWN)
		.map((f) => ({ severity: f.severity, message: f.message, start: cues[f.index]?.start ?? 0 }));
	let changes = null;
	const changesParam = Number(url.searchParams.get('changes'));
	if (track && Number.isInteger(changesParam) && changesParam >= 1) {
		const after = getVersion(track, changesParam);
		if (after) {
			const before = changesParam > 1 ? getVersion(track, changesParam - 1) : null;
			changes = {
				version: changesParam,
				diff: diffCues(before?.cues ?? [], after.cues)
			};
		}
	}
	return {
		recording: { id: recording.id, title: recording.title, status: recording.status },
		profile: { id: profile.id, label: profile.label },
		tracks,
		selectedId: selected?.id ?? null,
		versions: track ? listVersions(track) : [],
		findings,
		changes,
		newTrackForm: await superValidate(
			{ kind: 'captions', language: 'en-GB', label: '' },
			zod4(trackDetails),
			{ id: 'new-track', errors: false }
		),
		importForm: await superValidate(zod4(importForm), { id: 'import' }),
		restoreForm: await superValidate(zod4(restoreForm), { id: 'restore' })
	};
};

const importForm = z.object({ file: captionFile });

/** The restore buttons' form: which version to copy, and the current one when the page was drawn. */
const restoreForm = z.object({
	version: z.int().min(1),
	baseVersion: z.int().min(0).optional()
});

export const actions: Actions = {
	create: async ({ params, request }) => {
		const { recording } = requireOwnRecording(params.id);
		const form = await superValidate(request, zod4(trackDetails), { id: 'new-track' });
		if (!form.valid) return fail(400, { form });
		let id: string;
		try {
			id = createTrack(recording, form.data).id;
		} catch (problem) {
			if (problem instanceof CaptionError) {
				// The same kind in the same language again: a refusal of the pair, so of the form.
				form.message = problem.message;
				return fail(problem.status, { form });
			}
			throw problem;
		}
		redirect(
			303,
			resolve(`/(clinician)/recordings/[id=id]/captions?track=${id}`, { id: recording.id })
		);
	},
	import: async ({ params, request }) => {
		const { clinician, recording } = requireOwnRecording(params.id);
		const posted = await request.formData();
		const track = ownTrack(clinician.clinicId, recording.id, posted.get('track'));
		const form = await superValidate(posted, zod4(importForm), { id: 'import' });
		if (!form.valid) return fail(400, { form, problems: [] });
		const file = form.data.file;
		const result = importFile(track, new Uint8Array(await file.arrayBuffer()), file.name, {
			userId: clinician.id
		});
		if (!result.ok) {
			if ('conflict' in result) {
				form.message = 'Someone saved this track at the same moment; import the file again.';
				return fail(409, { form, problems: [] });
			}
			// The file's refusal sits on its field; each problem in it is listed by line beside it.
			form.errors.file = [result.message];
			return fail(422, { form, problems: result.errors });
		}
		return withFiles({
			form,
			imported: { filename: file.name, version: result.version, cueCount: result.cueCount },
			warnings: result.warnings
		});
	},
	restore: async ({ params, request }) => {
		const { clinician, recording } = requireOwnRecording(params.id);
		const posted = await request.formData();
		const track = ownTrack(clinician.clinicId, recording.id, posted.get('track'));
		const form = await superValidate(posted, zod4(restoreForm), { id: 'restore' });
		if (!form.valid) {
			return message(form, 'That version could not be read, so nothing was restored.', {
				status: 400
			});
		}
		const { version, baseVersion } = form.data;
		try {
			const result = restoreVersion(track, { version, baseVersion, userId: clinician.id });
			if (!result.ok) {
				return message(
					form,
					`Version ${result.conflict.current.version} was saved while this page was open, so nothing was restored. Look at it first, then restore again if you still want to.`,
					{ status: 409 }
				);
			}
			return { form, restored: { version, as: result.version } };
		} catch (problem) {
			if (problem instanceof CaptionError) {
				form.message = problem.message;
				return fail(problem.status, { form });
			}
			throw problem;
		}
	}
};
