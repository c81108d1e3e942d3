/** Words and tone for a patient's sign-in status, shared by the tables and the detail page. */
export const PATIENT_STATUS: Record<
	string,
	{ label: string; tone: 'good' | 'waiting' | 'stopped' | 'neutral' }
> = {
	active: { label: 'Signed up', tone: 'good' },
	pending: { label: 'Invited', tone: 'waiting' },
	expired: { label: 'Invitation expired', tone: 'stopped' },
	revoked: { label: 'Invitation withdrawn', tone: 'stopped' },
	accepted: { label: 'Signed up', tone: 'good' },
	'not invited': { label: 'Not invited', tone: 'neutral' }
};
