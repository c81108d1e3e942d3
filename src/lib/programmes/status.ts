/** A programme's state in words, with a tone for its badge (never colour alone). */
export const PROGRAMME_STATUS: Record<
	'draft' | 'published' | 'ended',
	{ label: string; tone: 'good' | 'waiting' | 'neutral'; help: string }
> = {
	draft: {
		label: 'Draft',
		tone: 'waiting',
		help: 'Only you see it; the patient sees it once it is published.'
	},
	published: {
		label: 'Published',
		tone: 'good',
		help: 'The patient follows it now; saving changes tells them by e-mail.'
	},
	ended: { label: 'Ended', tone: 'neutral', help: 'Finished or replaced; its logs are kept.' }
};
