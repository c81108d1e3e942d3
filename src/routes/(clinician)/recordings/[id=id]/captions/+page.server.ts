import { error, fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { z } from 'zod';
import { checkCues, profiles } from '$lib/captions/checks';
import { diffCues } from '$lib/captions/diff';
import { TRACK_KINDS } from '$lib/captions/types';
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

export const load: PageServerLoad = ({ params, url }) => {
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
		changes
	};
};

const createForm = z.object({
	kind: z.enum(TRACK_KINDS),
	language: z.string().trim().min(1, 'Give the language as a tag, such as en-GB.').max(35),
	label: z.string().trim().max(100)
});

export const actions: Actions = {
	create: async ({ params, request }) => {
		const { recording } = requireOwnRecording(params.id);
		const form = await request.formData();
		const values = {
			kind: String(form.get('kind') ?? ''),
			language: String(form.get('language') ?? ''),
			label: String(form.get('label') ?? '')
		};
		const parsed = createForm.safeParse(values);
		if (!parsed.success) {
			return fail(400, {
				action: 'create' as const,
				message: parsed.error.issues[0]?.message ?? 'Check the new track’s details.',
				values
			});
		}
		let id: string;
		try {
			id = createTrack(recording, parsed.data).id;
		} catch (problem) {
			if (problem instanceof CaptionError) {
				return fail(problem.status, {
					action: 'create' as const,
					message: problem.message,
					values
				});
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
		const form = await request.formData();
		const track = ownTrack(clinician.clinicId, recording.id, form.get('track'));
		const file = form.get('file');
		if (!(file instanceof File) || file.size === 0) {
			return fail(400, {
				action: 'import' as const,
				trackId: track.id,
				message: 'Choose a .vtt or .srt file to import.',
				problems: []
			});
		}
		const result = importFile(track, new Uint8Array(await file.arrayBuffer()), file.name, {
			userId: clinician.id
		});
		if (!result.ok) {
			const message =
				'conflict' in result
					? 'Someone saved this track at the same moment; import the file again.'
					: result.message;
			const problems = 'conflict' in result ? [] : result.errors;
			return fail('conflict' in result ? 409 : 422, {
				action: 'import' as const,
				trackId: track.id,
				filename: file.name,
				message,
				problems
			});
		}
		return {
			action: 'import' as const,
			trackId: track.id,
			imported: { filename: file.name, version: result.version, cueCount: result.cueCount },
			warnings: result.warnings
		};
	},
	restore: async ({ params, request }) => {
		const { clinician, recording } = requireOwnRecording(params.id);
		const form = await request.formData();
		const track = ownTrack(clinician.clinicId, recording.id, form.get('track'));
		const version = Number(form.get('version'));
		const base = Number(form.get('baseVersion'));
		try {
			const result = restoreVersion(track, {
				version,
				baseVersion: Number.isInteger(base) ? base : undefined,
				userId: clinician.id
			});
			if (!result.ok) {
				return fail(409, {
					action: 'restore' as const,
					trackId: track.id,
					message: `Version ${result.conflict.current.version} was saved while this page was open, so nothing was restored. Look at it first, then restore again if you still want to.`
				});
			}
			return {
				action: 'restore' as const,
				trackId: track.id,
				restored: { version, as: result.version }
			};
		} catch (problem) {
			if (problem instanceof CaptionError) {
				return fail(problem.status, {
					action: 'restore' as const,
					trackId: track.id,
					message: problem.message
				});
			}
			throw problem;
		}
	}
};
