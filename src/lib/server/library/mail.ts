/**
 * The e-mail a clinician gets when an educator decides on their submission: plain text and
 * simple HTML, in the look of Kinelume's other messages, with the educator's comments as
 * written (escaped, never rendered as markup).
 */
import type { Decision, SubmissionKind } from '$lib/library/types';
import type { MailContent } from '../mail/templates';
import escapeHtml from 'escape-html';

const HEADINGS: Record<Decision, (title: string) => string> = {
	approved: (title) => `“${title}” is now in the public library`,
	'changes-requested': (title) => `Changes requested for “${title}”`,
	rejected: (title) => `“${title}” was not accepted for the library`
};

const CAPTION_HEADINGS: Record<Decision, (title: string) => string> = {
	approved: (title) => `The new captions of “${title}” are in the public library`,
	'changes-requested': (title) => `Changes requested for the captions of “${title}”`,
	rejected: (title) => `The new captions of “${title}” were not accepted for the library`
};

const CAPTION_LEADS: Record<Decision, string> = {
	approved:
		'An educator approved your caption changes. The library now shows the exercise with the new captions; the clip and the words are as they were.',
	'changes-requested':
		'An educator reviewed your caption changes and asks for some more before they can be published. Their comments are below. Correct the captions, then send the caption changes again.',
	rejected:
		'An educator reviewed your caption changes and decided not to publish them. The library keeps the captions it had. Their reasons are below.'
};

const LEADS: Record<Decision, string> = {
	approved:
		'An educator approved your submission. Anyone can now watch it, with captions, in the Kinelume library. Later changes you submit will be reviewed before they replace this version.',
	'changes-requested':
		'An educator reviewed your submission and asks for some changes before it can be published. Their comments are below. Make the changes and submit the exercise again.',
	rejected:
		'An educator reviewed your submission and decided it should not go into the public library. Their reasons are below.'
};

export function decisionMail(input: {
	decision: Decision;
	/** A whole exercise, or only its captions; the words say which. */
	kind?: SubmissionKind;
	title: string;
	reviewerName: string;
	comment: string;
	/** Where the clinician acts next: the submission page of the exercise, or the public page. */
	url: string;
}): MailContent {
	const captions = input.kind === 'captions';
	const subject = (captions ? CAPTION_HEADINGS : HEADINGS)[input.decision](input.title);
	const lead = (captions ? CAPTION_LEADS : LEADS)[input.decision];
	const comment = input.comment.trim();
	const label =
		input.decision === 'approved' ? 'See it in the library' : 'Open the submission page';
	const textParts = [
		lead,
		...(comment ? [`${input.reviewerName} wrote:\n\n${comment}`] : []),
		`${label}: ${input.url}`
	];
	const commentHtml = comment
		? `<p style="margin:0 0 8px">${escapeHtml(input.reviewerName)} wrote:</p><blockquote style="margin:0 0 16px;padding:12px 16px;background:#e8eee9;border-left:4px solid #1f4d3e;white-space:pre-wrap">${escapeHtml(comment)}</blockquote>`
		: '';
	const html = `<!doctype html><html lang="en"><body style="margin:0;padding:24px;background:#faf8f4;color:#1c2230;font-family:Arial,sans-serif;font-size:18px;line-height:1.5">
<div style="max-width:560px;margin:0 auto">
<p style="margin:0 0 24px;font-weight:bold;color:#1f4d3e">Kinelume</p>
<h1 style="font-size:24px;margin:0 0 16px">${escapeHtml(subject)}</h1>
<p style="margin:0 0 16px">${escapeHtml(lead)}</p>${commentHtml}
<p style="margin:24px 0"><a href="${escapeHtml(input.url)}" style="display:inline-block;background:#1f4d3e;color:#ffffff;padding:12px 20px;border-radius:8px;text-decoration:none;font-weight:bold">${escapeHtml(label)}</a></p>
<p style="margin:0;color:#5a6272;font-size:16px">If the button does not work, copy this address into your browser:<br>${escapeHtml(input.url)}</p>
</div></body></html>`;
	return { subject, text: `${textParts.join('\n\n')}\n`, html };
}
