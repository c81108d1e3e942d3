import { clinicianApi, onlyPage, type MatrixPart } from './types';

/**
 * Follow-up: the caseload, the clinician's patient page (its plain rows are in the base list)
 * and the patient's follow-up JSON. Patients never reach any of it, not even their own figures.
 */
export const followupPart: MatrixPart = {
	rows: [
		{ route: '/(clinician)/caseload', path: () => '/caseload', expect: onlyPage('clinician') },
		{
			route: '/(clinician)/caseload',
			note: 'sorted, filtered, searched, paged (an address past the last page shows the last)',
			path: () => '/caseload?sort=pain&dir=desc&flag=pain-rise&q=wal&mine=1&page=9',
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/caseload',
			note: 'unreadable parameters fall back to the defaults',
			path: () => '/caseload?sort=%3Cscript%3E&dir=up&flag=nope&page=-1',
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/patients/[id=id]',
			note: 'own clinic, another normative table and every log',
			path: (f) => `/patients/${f.patientId}?norms=ama&logs=all`,
			expect: onlyPage('clinician')
		},
		{
			route: '/api/patients/[id=id]/followup.json',
			note: "own clinic's patient",
			path: (f) => `/api/patients/${f.patientId}/followup.json`,
			expect: clinicianApi(200)
		},
		{
			route: '/api/patients/[id=id]/followup.json',
			note: 'another normative table; the patient themself is refused (403)',
			path: (f) => `/api/patients/${f.patientId}/followup.json?norms=gill-2020`,
			expect: clinicianApi(200)
		},
		{
			route: '/api/patients/[id=id]/followup.json',
			note: "another clinic's patient",
			path: (f) => `/api/patients/${f.otherClinicPatientId}/followup.json`,
			expect: clinicianApi(404)
		},
		{
			route: '/api/patients/[id=id]/followup.json',
			note: 'an unknown normative table',
			path: (f) => `/api/patients/${f.patientId}/followup.json?norms=nope`,
			expect: clinicianApi(400)
		}
	]
};
