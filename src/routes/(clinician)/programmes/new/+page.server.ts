import { error, fail, redirect } from '@sveltejs/kit';
import { resolve } from '$app/paths';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
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

export const load: PageServerLoad = async ({ url }) => {
	const { clinician, patient } = patientFrom(url.searchParams.get('patient') ?? '');
	const blank = { title: 'Home programme', startDate: patientToday(patient), endDate: '' };
	return {
		patient: { id: patient.id, fullName: patient.fullName, condition: patient.condition },
		form: await superValidate(blank, zod4(programmeForm), { errors: false }),
		programmes: listProgrammesForPatient(clinician.clinicId, patient.id).map((p) => ({
			id: p.id,
			title: p.title,
			status: p.status,
			startDate: p.startDate
		}))
	};
};

const dates = z.object({
	startDate: z.string().refine(isLocalDate, 'Write the start date as a real date.'),
	endDate: z
		.string()
		.refine(
			(d) => d === '' || isLocalDate(d),
			'Write the end date as a real date, or leave it empty.'
		)
});

const programmeForm = z
	.object({
		title: z
			.string()
			.trim()
			.min(1, 'Give the programme a title.')
			.max(120, 'Keep the title under 120 characters.'),
		...dates.shape
	})
	.refine((f) => f.endDate === '' || f.endDate >= f.startDate, {
		message: 'The end date is before the start date.',
		path: ['endDate'],
		// Checked whenever both dates are dates, so a bad title does not hide it.
		when: (payload) => dates.safeParse(payload.value).success
	});

export const actions: Actions = {
	create: async ({ request }) => {
		const posted = await request.formData();
		// The patient comes with the form: the action's address has no room for it.
		const { clinician, patient } = patientFrom(String(posted.get('patient') ?? ''));
		const form = await superValidate(posted, zod4(programmeForm));
		if (!form.valid) return fail(400, { form });
		let id: string;
		try {
			id = createProgramme(clinician, patient.id, {
				title: form.data.title,
				startDate: form.data.startDate,
				endDate: form.data.endDate || null
			}).id;
		} catch (e) {
			if (e instanceof ProgrammeError) return message(form, e.message, { status: e.status });
			throw e;
		}
		redirect(303, resolve('/(clinician)/programmes/[id=id]', { id }));
	}
};
