import { error } from '@sveltejs/kit';
import { config } from '$lib/server/config';
import { calendarInputFor } from '$lib/server/sessions';
import { calendarFile } from '$lib/server/sessions/calendar';
import { requirePatient } from '$lib/server/sessions/guard';
import type { RequestHandler } from './$types';

/** The signed-in patient's session reminders, as a file their calendar program imports. */
export const GET: RequestHandler = () => {
	const { patient } = requirePatient();
	const input = calendarInputFor(patient, config().ORIGIN);
	if (!input) error(404, 'You have no home programme yet, so there are no reminders to add.');
	return new Response(calendarFile(input), {
		headers: {
			'Content-Type': 'text/calendar; charset=utf-8',
			'Content-Disposition': 'attachment; filename="kinelume-reminders.ics"',
			'Cache-Control': 'private, no-store'
		}
	});
};
