/** A state's word and the tone of its badge (never colour alone: StatusBadge shows the word). */
export interface StatusWords {
	label: string;
	tone: 'good' | 'waiting' | 'stopped' | 'neutral';
}

/**
 * An invitation's state, in the same words and badge wherever it shows (the clinic page's
 * invitations, the patients list, a patient's page).
 */
export const INVITATION_STATUS: Record<
	'pending' | 'accepted' | 'expired' | 'revoked',
	StatusWords
> = {
	pending: { label: 'Invited', tone: 'waiting' },
	accepted: { label: 'Signed up', tone: 'good' },
	expired: { label: 'Invitation expired', tone: 'stopped' },
	revoked: { label: 'Invitation withdrawn', tone: 'stopped' }
};

/** A patient's sign-in status, shared by the tables and the detail page: their invitation's, or more. */
export const PATIENT_STATUS: Record<string, StatusWords> = {
	...INVITATION_STATUS,
	active: { label: 'Signed up', tone: 'good' },
	'not invited': { label: 'Not invited', tone: 'neutral' }
};
