import { error, fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { z } from 'zod';
import { isLocalDate } from '$lib/clinical/calendar';
import { requireRole } from '$lib/server/auth/guard';
import { findPatientInClinic } from '$lib/server/patients';
import {
	createProgramme,
	listProgrammesForPatient,
	patientToday,
	ProgrammeError
} from '$lib/server/programmes';
import type { Actions, PageServerLoad } from './$types';

function patientFrom(id: string) {
	const clinician = requireRole('clinician');
	const patient = z.uuid().safeParse(id).success
		? findPatientInClinic(clinician.clinicId, id)
		: undefined;
	if (!patient) error(404, 'Not found.');
	return { clinician, patient };
}

export const load: PageServerLoad = ({ url }) => {
	const { clinician, patient } = patientFrom(url.searchParams.get('patient') ?? '');
	return {
		patient: { id: patient.id, fullName: patient.fullName, condition: patient.condition },
		today: patientToday(patient),
		programmes: listProgrammesForPatient(clinician.clinicId, patient.id).map((p) => ({
			id: p.id,
			title: p.title,
			status: p.status,
			startDate: p.startDate
		}))
	};
};

const form = z
	.object({
		title: z
			.string()
			.trim()
			.min(1, 'Give the programme a title.')
			.max(120, 'Keep the title under 120 characters.'),
		startDate: z.string().refine(isLocalDate, 'Write the start date as a real date.'),
		endDate: z
			.string()
			.refine(
				(d) => d === '' || isLocalDate(d),
				'Write the end date as a real date, or leave it empty.'
			)
	})
	.refine((f) => f.endDate === '' || f.endDate >= f.startDate, {
		message: 'The end date is before the start date.',
		path: ['endDate']
	});

export const actions: Actions = {
	create: async ({ request }) => {
		const raw = Object.fromEntries(await request.formData());
		// The patient comes with the form: the action's address has no room for it.
		const { clinician, patient } = patientFrom(String(raw.patient ?? ''));
		const values = {
			title: String(raw.title ?? ''),
			startDate: String(raw.startDate ?? ''),
			endDate: String(raw.endDate ?? '')
		};
		const parsed = form.safeParse(values);
		if (!parsed.success) return fail(400, { message: parsed.error.issues[0].message, values });
		let id: string;
		try {
			id = createProgramme(clinician, patient.id, {
				title: parsed.data.title,
				startDate: parsed.data.startDate,
				endDate: parsed.data.endDate || null
			}).id;
		} catch (e) {
			if (e instanceof ProgrammeError) return fail(e.status, { message: e.message, values });
			throw e;
		}
		redirect(303, resolve('/(clinician)/programmes/[id=id]', { id }));
	}
};
