/** The trade's words as a patient reads them, keeping the trade's word beside ours. */
export const POSITION_WORDS: Record<string, string> = {
	supine: 'Lying on your back (supine)',
	prone: 'Lying on your front (prone)',
	'side-lying': 'Lying on your side',
	seated: 'Sitting (seated)',
	standing: 'Standing'
};
