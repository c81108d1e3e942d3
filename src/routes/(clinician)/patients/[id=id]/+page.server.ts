import { error, fail } from '@sveltejs/kit';
import { z } from 'zod';
import { protocolById } from '$lib/clinical/phases';
import { describePrecaution, detailOf } from '$lib/clinical/precautions';
import { holdsOn } from '$lib/clinical/until';
import { formatDate } from '$lib/followup/words';
import { NORM_SOURCES } from '$lib/clinical/rom';
import { NORM_SOURCE_IDS, romEntrySchema } from '$lib/followup/rom-form';
import { requireRole } from '$lib/server/auth/guard';
import {
	addRomMeasurement,
	deleteRomMeasurement,
	patientFollowup,
	RomError
} from '$lib/server/followup';
import { cliniciansOf, findPatientInClinic, patientAccess } from '$lib/server/patients';
import type { Actions, PageServerLoad } from './$types';

/** Session logs listed at first; `?logs=all` lists every one. */
const LOGS_SHOWN = 20;

const viewQuery = z.object({
	norms: z.enum(NORM_SOURCE_IDS as [string, ...string[]]).catch('aaos'),
	logs: z.enum(['recent', 'all']).catch('recent')
});

export const load: PageServerLoad = ({ params, url }) => {
	const clinician = requireRole('clinician');
	// Scoped by clinic in the query: another clinic's patient is simply not found.
	const patient = findPatientInClinic(clinician.clinicId, params.id);
	if (!patient) error(404, 'No patient with that link in your clinic.');
	const view = viewQuery.parse({
		norms: url.searchParams.get('norms') ?? undefined,
		logs: url.searchParams.get('logs') ?? undefined
	});
	const normSource = view.norms as keyof typeof NORM_SOURCES;
	const followup = patientFollowup(clinician.clinicId, patient.id, { normSource })!;
	const access = patientAccess(patient);
	return {
		patient: {
			id: patient.id,
			fullName: patient.fullName,
			email: patient.email,
			affectedSide: patient.affectedSide,
			condition: patient.condition,
			operationDate: patient.operationDate,
			protocol: protocolById(patient.protocol)?.name ?? patient.protocol,
			protocolAppliesTo: protocolById(patient.protocol)?.appliesTo ?? null,
			protocolShiftWeeks: patient.protocolShiftWeeks,
			precautions: patient.precautions.map((p) => ({
				text: describePrecaution(p, patient.precautionDetails, patient.operationDate, formatDate),
				ended: !holdsOn(
					detailOf(patient.precautionDetails, p),
					patient.operationDate,
					followup.figures.today
				)
			})),
			slingUntil: patient.slingUntil,
			birthYear: patient.birthYear,
			sex: patient.sex,
			timeZone: patient.timeZone,
			addedAt: patient.createdAt.toISOString()
		},
		status: access.status,
		clinicians: cliniciansOf(patient.id),
		followup: {
			...followup,
			logs: view.logs === 'all' ? followup.logs : followup.logs.slice(0, LOGS_SHOWN)
		},
		logCount: followup.logs.length,
		view,
		normSources: Object.values(NORM_SOURCES).map((s) => ({
			id: s.id,
			name: s.name,
			citation: s.citation
		}))
	};
};

export const actions: Actions = {
	rom: async ({ params, request }) => {
		const clinician = requireRole('clinician');
		const raw = Object.fromEntries(await request.formData());
		const values = {
			motion: String(raw.motion ?? ''),
			side: String(raw.side ?? ''),
			mode: String(raw.mode ?? ''),
			degrees: String(raw.degrees ?? ''),
			measuredOn: String(raw.measuredOn ?? ''),
			note: String(raw.note ?? ''),
			instrument: String(raw.instrument ?? ''),
			armPosition: String(raw.armPosition ?? '')
		};
		const parsed = romEntrySchema.safeParse(values);
		if (!parsed.success) {
			const issue = parsed.error.issues[0];
			return fail(400, {
				action: 'rom',
				field: String(issue.path[0] ?? ''),
				message: issue.message,
				values
			});
		}
		try {
			addRomMeasurement(clinician, params.id, parsed.data);
		} catch (e) {
			if (!(e instanceof RomError)) throw e;
			if (!findPatientInClinic(clinician.clinicId, params.id)) error(404, 'Not found.');
			return fail(400, { action: 'rom', field: 'measuredOn', message: e.message, values });
		}
		// Keep the motion, side and mode for the next reading; clear what changes each time.
		return {
			action: 'rom',
			saved: `${parsed.data.degrees}° saved.`,
			values: { ...values, degrees: '', note: '' }
		};
	},
	deleteRom: async ({ params, request }) => {
		const clinician = requireRole('clinician');
		const form = await request.formData();
		const id = String(form.get('measurementId') ?? '');
		if (!findPatientInClinic(clinician.clinicId, params.id)) error(404, 'Not found.');
		if (!deleteRomMeasurement(clinician, params.id, id)) {
			return fail(404, { action: 'deleteRom', message: 'That reading was already removed.' });
		}
		return { action: 'deleteRom', saved: 'Reading removed.' };
	}
};
