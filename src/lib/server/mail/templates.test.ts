import { describe, expect, it } from 'vitest';
import { ISO_DATE_PATTERN } from '$lib/format/dates';
import {
	passwordChangedMail,
	patientInvitationMail,
	programmePublishedMail,
	signInLinkMail,
	staffInvitationMail,
	type MailContent
} from './templates';

const EXPIRES = new Date('2026-11-24T16:30:00Z');
const ZONE = 'Europe/London';

/** Every e-mail a person gets that carries a date, made from typical (invented) details. */
const MAILS: [string, MailContent][] = [
	[
		'staff invitation',
		staffInvitationMail({
			clinicName: 'Alder Street Clinic',
			role: 'clinician',
			inviterName: 'Noor Admin',
			url: 'http://localhost/invite/abc',
			expiresAt: EXPIRES,
			timeZone: ZONE
		})
	],
	[
		'patient invitation',
		patientInvitationMail({
			clinicName: 'Alder Street Clinic',
			patientName: 'Ines Marlow',
			clinicianName: 'Dr Vale',
			url: 'http://localhost/invite/def',
			expiresAt: EXPIRES,
			timeZone: ZONE
		})
	],
	[
		'sign-in link',
		signInLinkMail({ url: 'http://localhost/auth/x', expiresAt: EXPIRES, timeZone: ZONE })
	],
	[
		'password changed',
		passwordChangedMail({
			name: 'Ines Marlow',
			at: EXPIRES,
			timeZone: ZONE,
			firstPassword: false,
			signInUrl: 'http://localhost/sign-in'
		})
	],
	[
		'programme published',
		programmePublishedMail({
			clinicName: 'Alder Street Clinic',
			patientName: 'Ines Marlow',
			clinicianName: 'Dr Vale',
			title: 'Knee, weeks 1–4',
			startDate: '2026-11-24',
			exercises: [{ title: 'Heel slide', dosage: '1 set of 8' }],
			url: 'http://localhost/today',
			changed: false,
			hasAccount: true
		})
	]
];

describe('e-mails write dates for people', () => {
	it.each(MAILS)('the %s e-mail has no ISO date in its subject, text or HTML', (_, mail) => {
		for (const part of [mail.subject, mail.text, mail.html]) {
			expect(part).not.toMatch(ISO_DATE_PATTERN);
		}
	});

	it('dates the programme as every screen does', () => {
		const mail = MAILS.find(([name]) => name === 'programme published')![1];
		expect(mail.text).toContain('starting on Tuesday 24 Nov 2026');
		expect(mail.text).toContain('does not replace an assessment');
	});

	it('writes an expiry with its zone, the date as on every screen', () => {
		const mail = MAILS.find(([name]) => name === 'patient invitation')![1];
		expect(mail.text).toContain('until 24 Nov 2026, 16:30 GMT');
	});
});
