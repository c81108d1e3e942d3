/**
 * Finds what looks like a person's details in text meant for the public library: e-mail
 * addresses, telephone numbers, dates of birth, and other full calendar dates (which in an
 * exercise's words are most likely a birth or treatment date). It errs towards flagging, but
 * keeps clear of what exercise text is full of: dosages ("3 sets of 10"), counts ("1 2 3 4 5"),
 * caption times ("00:01:02.000"), angles ("90°") and year ranges.
 */

export type PatientDataKind = 'email' | 'phone' | 'date-of-birth' | 'date';

export const PATIENT_DATA_LABELS: Record<PatientDataKind, string> = {
	email: 'an e-mail address',
	phone: 'a telephone number (or another long number)',
	'date-of-birth': 'a date of birth',
	date: 'a full date (perhaps of a birth or a treatment)'
};

export interface PatientDataMatch {
	kind: PatientDataKind;
	/** The text that matched, as written. */
	text: string;
	start: number;
	end: number;
}

const EMAIL = /[A-Za-z0-9._%+-]+@[A-Za-z0-9-]+(?:\.[A-Za-z0-9-]+)*\.[A-Za-z]{2,}/g;

/** A run of digits and the separators phone numbers are written with, starting and ending on a digit. */
const PHONE_CANDIDATE = /(?<![\w.+/-])(?:\+ ?)?\(?\d[\d ().-]{5,24}\d(?![\w/:°%])/g;

const MONTHS = [
	'january',
	'february',
	'march',
	'april',
	'may',
	'june',
	'july',
	'august',
	'september',
	'october',
	'november',
	'december'
];
const MONTH_NAME = String.raw`(?:jan(?:uary)?|feb(?:ruary)?|mar(?:ch)?|apr(?:il)?|may|june?|july?|aug(?:ust)?|sep(?:t(?:ember)?)?|oct(?:ober)?|nov(?:ember)?|dec(?:ember)?)\.?`;
const DAY = String.raw`(?:0?[1-9]|[12]\d|3[01])(?:st|nd|rd|th)?`;
// Two-digit years only with slashes ("02/03/50"); with dots or dashes the year has four digits,
// so "10-15-20" (a rep scheme) is not a date.
const NUMERIC_DATE = String.raw`(?:\d{1,2}/\d{1,2}/(?:\d{4}|\d{2})|\d{1,2}(?<sep>[.-])\d{1,2}\k<sep>\d{4}|\d{4}-\d{1,2}-\d{1,2})`;
const WORDED_DATE = String.raw`(?:${DAY}\s+(?:of\s+)?${MONTH_NAME},?\s+\d{4}|${MONTH_NAME}\s+${DAY},?\s+\d{4})`;
const ANY_DATE = `(?:${NUMERIC_DATE}|${WORDED_DATE})`;

const DATE = new RegExp(String.raw`(?<![\w/.-])${ANY_DATE}(?![\w/])`, 'gi');
const BIRTH_KEYWORD = String.raw`(?:d\.?\s?o\.?\s?b\.?|date\s+of\s+birth|birth\s?date|born(?:\s+on)?)`;
const DATE_OF_BIRTH = new RegExp(
	String.raw`\b${BIRTH_KEYWORD}\s*[:=-]?\s*(?:on\s+)?${ANY_DATE}(?![\w/])`,
	'gi'
);

function isCalendarDate(day: number, month: number, year: number): boolean {
	if (!(month >= 1 && month <= 12 && day >= 1)) return false;
	const days = new Date(Date.UTC(year, month, 0)).getUTCDate();
	return day <= days;
}

/** Whether a matched date is a real day (either day/month order), so "10/45/20" is not one. */
function isRealDate(text: string): boolean {
	const numeric = /^(\d{1,4})[/.-](\d{1,2})[/.-](\d{1,4})$/.exec(text.trim());
	if (numeric) {
		const [a, b, c] = numeric.slice(1).map(Number);
		if (numeric[1].length === 4) return isCalendarDate(c, b, a);
		const year = numeric[3].length === 2 ? 1900 + c : c;
		return isCalendarDate(a, b, year) || isCalendarDate(b, a, year);
	}
	const lower = text.toLowerCase();
	const month = MONTHS.findIndex((m) => lower.includes(m.slice(0, 3))) + 1;
	const numbers = [...lower.matchAll(/\d+/g)].map((m) => Number(m[0]));
	const year = numbers.find((n) => n >= 1000);
	const day = numbers.find((n) => n < 32);
	return month > 0 && year !== undefined && day !== undefined && isCalendarDate(day, month, year);
}

/**
 * Whether a candidate run of digits is written like a telephone number: 10–13 digits (8–15
 * after a leading "+", the E.164 maximum being 15), one kind of separator between groups, at
 * most four groups with one of three digits or more (seven after a "+"), and no more than two
 * single-digit groups — a count such as "1 2 3 4 5 6 7 8 9 10" or "10 10 10 10 10" is none.
 */
function looksLikePhone(candidate: string): boolean {
	const digits = candidate.replace(/\D/g, '');
	const international = candidate.startsWith('+');
	const [fewest, most] = international ? [8, 15] : [10, 13];
	if (digits.length < fewest || digits.length > most) return false;
	const separators = candidate.match(/[^\d+]+/g) ?? [];
	if (separators.some((s) => s.length > 3 || /\s{2}/.test(s))) return false;
	const marks = separators.map((s) => s.replace(/[()\s]/g, '')).filter(Boolean);
	if (new Set(marks).size > 1) return false;
	// Dots between every group is a US style (555.555.0123); decimals such as "1.5 2.5" are not.
	if (marks.includes('.') && separators.some((s) => s !== '.')) return false;
	const groups = candidate.split(/\D+/).filter(Boolean);
	if (international ? groups.length > 7 : groups.length > 4) return false;
	if (!international && Math.max(...groups.map((g) => g.length)) < 3) return false;
	const singles = groups.slice(international ? 1 : 0).filter((g) => g.length === 1).length;
	if (singles > 2) return false;
	const opens = (candidate.match(/\(/g) ?? []).length;
	const closes = (candidate.match(/\)/g) ?? []).length;
	return opens === closes;
}

function overlaps(a: PatientDataMatch, b: PatientDataMatch): boolean {
	return a.start < b.end && b.start < a.end;
}

/** Every match in `text`, in order, none overlapping (a date of birth wins over its bare date). */
export function findPatientData(text: string): PatientDataMatch[] {
	const found: PatientDataMatch[] = [];
	const add = (kind: PatientDataKind, match: RegExpMatchArray) => {
		const start = match.index ?? 0;
		const candidate = { kind, text: match[0], start, end: start + match[0].length };
		if (!found.some((f) => overlaps(f, candidate))) found.push(candidate);
	};
	for (const match of text.matchAll(EMAIL)) add('email', match);
	for (const match of text.matchAll(DATE_OF_BIRTH)) add('date-of-birth', match);
	for (const match of text.matchAll(DATE)) if (isRealDate(match[0])) add('date', match);
	for (const match of text.matchAll(PHONE_CANDIDATE))
		if (looksLikePhone(match[0])) add('phone', match);
	return found.sort((a, b) => a.start - b.start);
}

/** A short piece of `text` around a match, for showing the reviewer where it is. */
export function excerptAround(text: string, match: PatientDataMatch, room = 30): string {
	const from = Math.max(0, match.start - room);
	const to = Math.min(text.length, match.end + room);
	return `${from > 0 ? '…' : ''}${text.slice(from, to).replace(/\s+/g, ' ')}${to < text.length ? '…' : ''}`;
}
