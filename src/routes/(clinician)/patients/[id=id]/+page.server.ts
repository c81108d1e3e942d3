import { error, fail } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { protocolById } from '$lib/clinical/phases';
import { describePrecaution, detailOf } from '$lib/clinical/precautions';
import { holdsOn } from '$lib/clinical/until';
import { formatDate } from '$lib/followup/words';
import { NORM_SOURCES } from '$lib/clinical/rom';
import {
	NORM_SOURCE_IDS,
	romEntryDefaults,
	romEntryForm,
	romEntrySchema
} from '$lib/followup/rom-form';
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

export const load: PageServerLoad = async ({ params, url }) => {
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
		romForm: await superValidate(
			romEntryDefaults(followup.figures.rom.at(-1), patient, followup.figures.today),
			zod4(romEntryForm),
			{ id: 'rom', errors: false }
		),
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
		const form = await superValidate(request, zod4(romEntryForm), { id: 'rom' });
		if (!form.valid) return fail(400, { form });
		// The form's checks are this schema's: what passed them reads as an entry.
		const entry = romEntrySchema.parse(form.data);
		try {
			addRomMeasurement(clinician, params.id, entry);
		} catch (e) {
			if (!(e instanceof RomError)) throw e;
			if (!findPatientInClinic(clinician.clinicId, params.id)) error(404, 'Not found.');
			return setError(form, 'measuredOn', e.message);
		}
		// Keep the motion, side and mode for the next reading; clear what changes each time.
		form.data = { ...form.data, degrees: '', note: '' };
		return { form, action: 'rom', saved: `${entry.degrees}° saved.` };
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
