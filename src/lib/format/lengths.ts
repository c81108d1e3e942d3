/**
 * How long a recording, a clip or a demonstration lasts, written one way on every screen and in
 * every e-mail: "39 s", "2 min", "2 min 39 s", "1 h 2 min 3 s" (whole seconds, rounded). Moments
 * inside a clip (a playhead, a cue's start) are positions, not lengths, and keep their clock form.
 */
export function formatLength(seconds: number | null | undefined): string {
	if (seconds === null || seconds === undefined || !Number.isFinite(seconds) || seconds < 0) {
		return '—';
	}
	const whole = Math.round(seconds);
	if (whole === 0) return seconds > 0 ? 'under 1 s' : '0 s';
	const h = Math.floor(whole / 3600);
	const min = Math.floor((whole % 3600) / 60);
	const s = whole % 60;
	const parts = [h ? `${h} h` : '', min ? `${min} min` : '', s ? `${s} s` : ''];
	return parts.filter(Boolean).join(' ');
}
