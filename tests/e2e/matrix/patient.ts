import { seedProgramme } from '../programme-fixtures';
import { everyone, onlyPage, type MatrixPart } from './types';

/**
 * The patient's pages and endpoints: Today's reminders file, the replay of one programme item,
 * the session log and the caption style. The matrix's patient gets a published programme here
 * (published in the past, so a programme published later by another test stays their current
 * one); another patient's item, a draft's item and another clinic's item all read as 404.
 */
const notTheirs = { ...onlyPage('patient'), patient: 404 };

export const patientPart: MatrixPart = {
	seed(f) {
		const longAgo = Date.parse('2026-01-05T09:00:00Z');
		const own = seedProgramme(
			f.patientId,
			[{ title: 'Matrix quad sets', safetyNotes: 'Stop if the knee swells.' }],
			{ startDate: '2026-01-05', publishedAt: longAgo }
		);
		const draft = seedProgramme(f.patientId, [{ title: 'Matrix draft exercise' }], {
			status: 'draft'
		});
		const other = seedProgramme(f.otherPatientId, [{ title: 'Matrix balance' }], {
			publishedAt: longAgo
		});
		const otherClinic = seedProgramme(f.otherClinicPatientId, [{ title: 'Matrix other clinic' }], {
			publishedAt: longAgo
		});
		return {
			ownItemId: own.itemIds[0],
			draftItemId: draft.itemIds[0],
			otherPatientItemId: other.itemIds[0],
			otherClinicItemId: otherClinic.itemIds[0]
		};
	},
	rows: [
		{
			route: '/(patient)/today/calendar.ics',
			note: "the patient's own reminders",
			path: () => '/today/calendar.ics',
			expect: onlyPage('patient')
		},
		{
			route: '/(patient)/replay/[id=id]',
			note: "an item of the patient's published programme",
			path: (f) => `/replay/${f.extra.ownItemId}`,
			expect: onlyPage('patient')
		},
		{
			route: '/(patient)/replay/[id=id]',
			note: "another patient's item, same clinic",
			path: (f) => `/replay/${f.extra.otherPatientItemId}`,
			expect: notTheirs
		},
		{
			route: '/(patient)/replay/[id=id]',
			note: "another clinic's patient's item",
			path: (f) => `/replay/${f.extra.otherClinicItemId}`,
			expect: notTheirs
		},
		{
			route: '/(patient)/replay/[id=id]',
			note: "an item of the patient's draft programme",
			path: (f) => `/replay/${f.extra.draftItemId}`,
			expect: notTheirs
		},
		{
			route: '/api/sessions',
			note: 'POST only (its roles are checked in patient.e2e.ts)',
			path: () => '/api/sessions',
			expect: everyone(405)
		},
		{
			route: '/api/me/caption-style',
			note: "the caller's own style",
			path: () => '/api/me/caption-style',
			expect: { public: 401, patient: 200, clinician: 403, educator: 403, admin: 403 }
		}
	]
};
