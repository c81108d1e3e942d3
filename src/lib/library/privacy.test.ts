import { describe, expect, it } from 'vitest';
import { excerptAround, findPatientData, type PatientDataKind } from './privacy';

const kinds = (text: string): PatientDataKind[] => findPatientData(text).map((m) => m.kind);
const texts = (text: string): string[] => findPatientData(text).map((m) => m.text);

describe('findPatientData: e-mail addresses', () => {
	it('finds plain and subaddressed addresses', () => {
		expect(texts('Write to walter.brindle@mail.example for the sheet.')).toEqual([
			'walter.brindle@mail.example'
		]);
		expect(texts('Ask j+knee@clinic.co.example')).toEqual(['j+knee@clinic.co.example']);
	});

	it('does not take an @ in a sentence for an address', () => {
		expect(kinds('Hold @ the top for 5 seconds')).toEqual([]);
	});
});

describe('findPatientData: telephone numbers', () => {
	// Shapes each country prints (common practice). The UK examples sit in Ofcom's ranges kept
	// for drama and the US ones in 555-01xx, so that they reach nobody (both from memory).
	it.each([
		['07700 900123', 'UK mobile, national'],
		['07700900123', 'UK mobile, no spaces'],
		['+44 7700 900123', 'UK mobile, international'],
		['+44 (0)20 7946 0958', 'UK London with the trunk zero in brackets'],
		['020 7946 0958', 'UK London, national'],
		['(020) 7946 0958', 'UK area code in brackets'],
		['0161 496 0000', 'UK Manchester'],
		['(555) 555-0123', 'US with area code in brackets'],
		['555-555-0123', 'US with dashes'],
		['555.555.0123', 'US with dots'],
		['+1 555 555 0123', 'US, international'],
		['1-800-555-0199', 'US toll-free with trunk 1'],
		['+33 1 23 45 67 89', 'French, international'],
		['+49 30 1234567', 'German, international']
	])('finds %s (%s)', (number) => {
		expect(texts(`Call ${number} if it swells.`)).toEqual([number]);
	});

	it('finds a number at the end of a sentence without its full stop', () => {
		expect(texts('Ring 020 7946 0958.')).toEqual(['020 7946 0958']);
	});

	it.each([
		['3 sets of 10 repetitions, 2 times a day'],
		['Count 1 2 3 4 5 6 7 8 9 10 as you lift'],
		['10 10 10 10 10'],
		['The cue runs 00:01:02.000 --> 00:01:04.500'],
		['Bend the knee to 90° and hold for 30 s'],
		['Weeks 0-2, 2-6 and 6-12 of the protocol'],
		['Aim for 1.5 2.5 and then 3.5 kg'],
		['From 2019-2020 the protocol changed'],
		['Hold 10-15-20 seconds as you progress'],
		['Rest 60 seconds between 3 sets of 12']
	])('leaves exercise text alone: %s', (text) => {
		expect(findPatientData(text)).toEqual([]);
	});
});

describe('findPatientData: dates of birth and other dates', () => {
	it.each([
		'DOB 02/03/1950',
		'D.O.B. 2/3/50',
		'dob: 1950-03-02',
		'Date of birth 02.03.1950',
		'born 2 March 1950',
		'born on 2nd March 1950',
		'Born March 2, 1950',
		'birthdate 2 Mar 1950'
	])('finds "%s" as a date of birth', (text) => {
		expect(findPatientData(`Patient ${text}, right knee.`)).toMatchObject([
			{ kind: 'date-of-birth' }
		]);
	});

	it('keeps the keyword in the match, so the reviewer sees why', () => {
		expect(texts('DOB 02/03/1950 is on file')).toEqual(['DOB 02/03/1950']);
	});

	it('finds a full date written alone as a date', () => {
		expect(kinds('Operated on 14/11/2026 by the knee team')).toEqual(['date']);
		expect(kinds('Seen 3 December 2026')).toEqual(['date']);
		expect(kinds('Review 2026-12-15')).toEqual(['date']);
	});

	it('does not take impossible dates or partial ones for dates', () => {
		expect(findPatientData('Try 10/45/20 of them')).toEqual([]);
		expect(findPatientData('In March, start the seated version')).toEqual([]);
		expect(findPatientData('By week 6 of 12')).toEqual([]);
	});
});

describe('findPatientData: several at once', () => {
	it('lists every match in order, a date of birth once (not again as a date)', () => {
		const text = 'Walter, DOB 02/03/1950, tel 07700 900123, walter@mail.example';
		expect(findPatientData(text).map((m) => [m.kind, m.text])).toEqual([
			['date-of-birth', 'DOB 02/03/1950'],
			['phone', '07700 900123'],
			['email', 'walter@mail.example']
		]);
	});

	it('gives positions that point at the matched text', () => {
		const text = 'Ring 0161 496 0000 today';
		const [match] = findPatientData(text);
		expect(text.slice(match.start, match.end)).toBe('0161 496 0000');
	});
});

describe('excerptAround', () => {
	it('shows the match with some words either side', () => {
		const text = `${'a '.repeat(40)}call 0161 496 0000 now ${'b '.repeat(40)}`;
		const [match] = findPatientData(text);
		const excerpt = excerptAround(text, match, 10);
		expect(excerpt).toContain('0161 496 0000');
		expect(excerpt.startsWith('…')).toBe(true);
		expect(excerpt.endsWith('…')).toBe(true);
	});
});
