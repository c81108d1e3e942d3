import { cliniciansOf } from '$lib/server/patients';
import { todayFor } from '$lib/server/sessions';
import { requirePatient } from '$lib/server/sessions/guard';
import type { PageServerLoad } from './$types';

/** "Good morning" and the like, by the hour on the patient's own clock. */
function greetingAt(now: number, timeZone: string): string {
	const hour = Number(
		new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', hourCycle: 'h23' }).format(now)
	);
	return hour < 12 ? 'Good morning' : hour < 18 ? 'Good afternoon' : 'Good evening';
}

export const load: PageServerLoad = () => {
	// A patient only ever reads their own record: it comes from the session, never the URL.
	const { principal, patient } = requirePatient();
	const now = Date.now();
	return {
		greeting: greetingAt(now, patient.timeZone),
		firstName: patient.fullName.split(/\s+/)[0],
		clinicName: principal.clinicName,
		clinicians: cliniciansOf(patient.id),
		queueOwner: patient.id,
		view: todayFor(patient, now)
	};
};
