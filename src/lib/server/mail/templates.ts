/**
 * Kinelume's e-mails, each as plain text and simple HTML. Links are absolute so that they work
 * from any mail client. The wording is ours, plain, and says who sent the message and why.
 */
import { formatInstant } from '$lib/format/instants';
import { formatDay } from '$lib/format/dates';
import escapeHtml from 'escape-html';

export interface MailContent {
	subject: string;
	text: string;
	html: string;
}

function layout(
	heading: string,
	paragraphs: string[],
	link: { url: string; label: string }
): string {
	const body = paragraphs.map((p) => `<p style="margin:0 0 16px">${escapeHtml(p)}</p>`).join('');
	return `<!doctype html><html lang="en"><body style="margin:0;padding:24px;background:#faf8f4;color:#1c2230;font-family:Arial,sans-serif;font-size:18px;line-height:1.5">
<div style="max-width:560px;margin:0 auto">
<p style="margin:0 0 24px;font-weight:bold;color:#1f4d3e">Kinelume</p>
<h1 style="font-size:24px;margin:0 0 16px">${escapeHtml(heading)}</h1>${body}
<p style="margin:24px 0"><a href="${escapeHtml(link.url)}" style="display:inline-block;background:#1f4d3e;color:#ffffff;padding:12px 20px;border-radius:8px;text-decoration:none;font-weight:bold">${escapeHtml(link.label)}</a></p>
<p style="margin:0;color:#5a6272;font-size:16px">If the button does not work, copy this address into your browser:<br>${escapeHtml(link.url)}</p>
</div></body></html>`;
}

const ROLE_WORDS: Record<string, string> = {
	admin: 'an admin',
	clinician: 'a clinician',
	educator: 'an educator'
};

export function staffInvitationMail(input: {
	clinicName: string;
	role: string;
	inviterName: string;
	url: string;
	expiresAt: Date;
	timeZone: string;
}): MailContent {
	const subject = `You are invited to join ${input.clinicName} on Kinelume`;
	const lines = [
		`${input.inviterName} has invited you to join ${input.clinicName} on Kinelume as ${ROLE_WORDS[input.role] ?? input.role}.`,
		`The link works once and until ${formatInstant(input.expiresAt, input.timeZone, 'date-time-zone')}. If you did not expect this message, you can ignore it.`
	];
	return {
		subject,
		text: `${lines.join('\n\n')}\n\nAccept the invitation: ${input.url}\n`,
		html: layout(subject, lines, { url: input.url, label: 'Accept the invitation' })
	};
}

export function patientInvitationMail(input: {
	clinicName: string;
	patientName: string;
	clinicianName: string;
	url: string;
	expiresAt: Date;
	timeZone: string;
}): MailContent {
	const subject = `${input.clinicName} has set up Kinelume for your home exercises`;
	const lines = [
		`Hello ${input.patientName},`,
		`${input.clinicianName} at ${input.clinicName} will share your home exercise programme with you on Kinelume: short videos with captions, one exercise at a time.`,
		`Open the link to set up your account. It works once and until ${formatInstant(input.expiresAt, input.timeZone, 'date-time-zone')}.`,
		'If anything in your programme causes sharp or worsening pain, stop and contact your clinician.'
	];
	return {
		subject,
		text: `${lines.join('\n\n')}\n\nSet up your account: ${input.url}\n`,
		html: layout(subject, lines, { url: input.url, label: 'Set up my account' })
	};
}

/** One patient's lines in a clinician's weekly digest. */
export interface DigestPatient {
	name: string;
	url: string;
	/** Each flag with the numbers behind it. */
	flags: { label: string; detail: string }[];
	adherence: string;
	pain: string | null;
	lastSession: string;
}

/**
 * A clinician's weekly digest: flagged patients first, each flag with its numbers, then everyone
 * else's adherence; the basis of the figures and the usual caution close it.
 */
export function weeklyDigestMail(input: {
	clinicianName: string;
	clinicName: string;
	weekLabel: string;
	asOf: string;
	patients: DigestPatient[];
	caseloadUrl: string;
	basis: string[];
}): MailContent {
	const flagged = input.patients.filter((p) => p.flags.length > 0);
	const others = input.patients.filter((p) => p.flags.length === 0);
	const count = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;
	const subject = `Your Kinelume week of ${input.weekLabel}: ${count(flagged.length, 'patient', 'patients')} flagged`;
	const intro = [
		`Hello ${input.clinicianName},`,
		`Here is how your ${count(input.patients.length, 'patient', 'patients')} at ${input.clinicName} stood on ${input.asOf}. ${flagged.length === 0 ? 'No one is flagged this week.' : `${count(flagged.length, 'patient is', 'patients are')} flagged.`}`
	];
	const facts = (p: DigestPatient) => [
		`Adherence, 7 days: ${p.adherence}`,
		...(p.pain ? [`Pain: ${p.pain}`] : []),
		`Last session: ${p.lastSession}`
	];
	const closing = [
		...input.basis,
		'These figures count what patients log; they do not replace an assessment. The treating clinician and the surgeon’s protocol decide what changes.'
	];

	const textPatient = (p: DigestPatient) =>
		[
			`${p.name} — ${p.url}`,
			...p.flags.map((f) => `  ! ${f.label}: ${f.detail}`),
			...facts(p).map((line) => `  ${line}`)
		].join('\n');
	const text = [
		...intro,
		...(flagged.length ? ['FLAGGED', ...flagged.map(textPatient)] : []),
		...(others.length ? ['NO FLAGS', ...others.map(textPatient)] : []),
		`Open the caseload: ${input.caseloadUrl}`,
		...closing
	].join('\n\n');

	const htmlPatient = (p: DigestPatient) =>
		`<li style="margin:0 0 16px"><a href="${escapeHtml(p.url)}" style="color:#3b4f7a;font-weight:bold">${escapeHtml(p.name)}</a>` +
		p.flags
			.map(
				(f) =>
					`<div style="margin:4px 0;padding:6px 8px;border:2px solid #7a5c12;border-radius:6px"><strong style="color:#7a5c12">Flag: ${escapeHtml(f.label)}</strong><br>${escapeHtml(f.detail)}</div>`
			)
			.join('') +
		facts(p)
			.map((line) => `<div style="font-size:16px">${escapeHtml(line)}</div>`)
			.join('') +
		'</li>';
	const section = (title: string, list: DigestPatient[]) =>
		list.length
			? `<h2 style="font-size:20px;margin:24px 0 8px">${escapeHtml(title)}</h2><ul style="padding-left:20px;margin:0">${list.map(htmlPatient).join('')}</ul>`
			: '';
	const html = `<!doctype html><html lang="en"><body style="margin:0;padding:24px;background:#faf8f4;color:#1c2230;font-family:Arial,sans-serif;font-size:18px;line-height:1.5">
<div style="max-width:640px;margin:0 auto">
<p style="margin:0 0 24px;font-weight:bold;color:#1f4d3e">Kinelume</p>
<h1 style="font-size:24px;margin:0 0 16px">${escapeHtml(subject)}</h1>
${intro.map((p) => `<p style="margin:0 0 16px">${escapeHtml(p)}</p>`).join('')}
${section('Flagged', flagged)}${section('No flags', others)}
<p style="margin:24px 0"><a href="${escapeHtml(input.caseloadUrl)}" style="display:inline-block;background:#1f4d3e;color:#ffffff;padding:12px 20px;border-radius:8px;text-decoration:none;font-weight:bold">Open the caseload</a></p>
${closing.map((p) => `<p style="margin:0 0 12px;color:#5a6272;font-size:16px">${escapeHtml(p)}</p>`).join('')}
</div></body></html>`;
	return { subject, text: `${text}\n`, html };
}

export function signInLinkMail(input: {
	url: string;
	expiresAt: Date;
	timeZone: string;
}): MailContent {
	const subject = 'Your Kinelume sign-in link';
	const lines = [
		'Use the button below to sign in to Kinelume. The link works once.',
		`It expires at ${formatInstant(input.expiresAt, input.timeZone, 'date-time-zone')}. If you did not ask for it, you can ignore this message: nobody can sign in without it.`
	];
	return {
		subject,
		text: `${lines.join('\n\n')}\n\nSign in: ${input.url}\n`,
		html: layout(subject, lines, { url: input.url, label: 'Sign in to Kinelume' })
	};
}

/**
 * To the owner of an account whose password was just set or changed: if it was not them, someone
 * holding one of their sessions did it, and the way back is an e-mailed link and their clinic.
 */
export function passwordChangedMail(input: {
	name: string;
	firstPassword: boolean;
	at: Date;
	timeZone: string;
	signInUrl: string;
}): MailContent {
	const subject = input.firstPassword
		? 'A password was set on your Kinelume account'
		: 'Your Kinelume password was changed';
	const lines = [
		`Hello ${input.name},`,
		`${input.firstPassword ? 'A password was set on' : 'The password of'} your Kinelume account ${input.firstPassword ? '' : 'was changed '}on ${formatInstant(input.at, input.timeZone, 'date-time-zone')}. Your other sessions were signed out.`,
		'If this was you, there is nothing to do. If it was not, sign in with a link sent to this address, choose a new password on your account page, use “Sign out everywhere”, and tell your clinic.'
	];
	return {
		subject,
		text: `${lines.join('\n\n')}\n\nSign in: ${input.signInUrl}\n`,
		html: layout(subject, lines, { url: input.signInUrl, label: 'Sign in to Kinelume' })
	};
}

/** A patient's home programme was published, or changed after publishing. */
export function programmePublishedMail(input: {
	clinicName: string;
	patientName: string;
	clinicianName: string;
	title: string;
	startDate: string;
	exercises: { title: string; dosage: string }[];
	url: string;
	changed: boolean;
	/** False while the patient has not yet accepted their invitation. */
	hasAccount: boolean;
}): MailContent {
	const subject = input.changed
		? `Your home programme from ${input.clinicName} has changed`
		: `Your home programme from ${input.clinicName} is ready`;
	const lines = [
		`Hello ${input.patientName},`,
		input.changed
			? `${input.clinicianName} has changed your home programme "${input.title}". Please follow the new version from now on.`
			: `${input.clinicianName} has set up your home programme "${input.title}", starting on ${formatDay(input.startDate, { year: true })}.`,
		...input.exercises.map((e, i) => `${i + 1}. ${e.title}: ${e.dosage}`),
		input.hasAccount
			? 'Open it to replay each exercise with captions and to log your sessions.'
			: 'To open it, first set up your account with the invitation e-mail we sent to this address (ask the clinic for a new one if it has expired).',
		'If anything in your programme causes sharp or worsening pain, new numbness or swelling, stop and contact your clinician. This programme was prescribed for you and does not replace an assessment.'
	];
	return {
		subject,
		text: `${lines.join('\n\n')}\n\nOpen your programme: ${input.url}\n`,
		html: layout(subject, lines, { url: input.url, label: 'Open my programme' })
	};
}

/**
 * To a patient's clinician when a log carries severe pain (7 to 10) or "sharp or new pain". The
 * subject names no patient (it shows on lock screens); the body says what was logged and links to
 * the patient's page. A prompt to look, not an assessment.
 */
export function painAlertMail(input: {
	clinicianName: string;
	clinicName: string;
	patientName: string;
	exerciseTitle: string;
	score: number;
	severe: boolean;
	sharp: boolean;
	dateText: string;
	hasNote: boolean;
	url: string;
}): MailContent {
	const subject = 'Kinelume: a patient logged severe or sharp pain';
	const what = [
		`pain ${input.score}/10`,
		...(input.sharp ? ['ticked “sharp or new pain”'] : [])
	].join(' and ');
	const lines = [
		`Hello ${input.clinicianName},`,
		`${input.patientName} (${input.clinicName}) logged ${what} after “${input.exerciseTitle}” on ${input.dateText}.${input.hasNote ? ' Their note is on their page.' : ''}`,
		...(input.severe
			? ['7 to 10 is severe on the 0–10 scale (Serlin et al., Pain 1995, set in cancer pain).']
			: []),
		'Kinelume sends at most one such e-mail a patient a day. It is a prompt to look, not an assessment: the treating clinician decides what happens next.'
	];
	return {
		subject,
		text: `${lines.join('\n\n')}\n\nOpen their page: ${input.url}\n`,
		html: layout(subject, lines, { url: input.url, label: 'Open their page' })
	};
}
