/**
 * How long one session of an exercise takes, as an estimate for the patient ("about 4 minutes")
 * and for the clinician summing a programme.
 */
import type { Dosage } from './types';

/**
 * Seconds one repetition's movement takes, excluding any hold: given directly, or read from a
 * demonstration segment as its length over the repetitions it shows.
 */
export type RepPace = { secondsPerRep: number } | { segmentSeconds: number; repsShown: number };

/** Common practice: a slow, controlled rep of about 2 s out and 2 s back. */
export const DEFAULT_SECONDS_PER_REP = 4;

/** Seconds per rep from a pace; throws when the pace has no positive length. */
export function secondsPerRep(pace: RepPace): number {
	const seconds =
		'secondsPerRep' in pace ? pace.secondsPerRep : pace.segmentSeconds / pace.repsShown;
	if (!Number.isFinite(seconds) || seconds <= 0) {
		throw new RangeError(
			'A rep must take some time: give seconds per rep, or a segment with reps.'
		);
	}
	return seconds;
}

export interface SessionTimeOptions {
	/** Seconds between one rep and the next within a set (default 0). */
	restBetweenRepsSeconds?: number;
}

/**
 * Estimated seconds for one session:
 * sets × reps × (seconds per rep + hold) + sets × (reps − 1) × rest between reps
 * + (sets − 1) × rest between sets. No rest is counted after the last rep or the last set.
 * A pace read from a segment includes whatever the demonstration shows (talk, a demonstrated
 * hold), so it errs long.
 */
export function sessionSeconds(
	d: Pick<Dosage, 'sets' | 'reps' | 'holdSeconds' | 'restSeconds'>,
	pace: RepPace = { secondsPerRep: DEFAULT_SECONDS_PER_REP },
	options: SessionTimeOptions = {}
): number {
	const perRep = secondsPerRep(pace) + d.holdSeconds;
	const betweenReps = options.restBetweenRepsSeconds ?? 0;
	return (
		d.sets * d.reps * perRep +
		d.sets * Math.max(0, d.reps - 1) * betweenReps +
		Math.max(0, d.sets - 1) * d.restSeconds
	);
}

/** Estimated minutes for one session: `sessionSeconds` ÷ 60, unrounded. */
export function sessionMinutes(
	d: Pick<Dosage, 'sets' | 'reps' | 'holdSeconds' | 'restSeconds'>,
	pace?: RepPace,
	options?: SessionTimeOptions
): number {
	return sessionSeconds(d, pace, options) / 60;
}

/** Minutes as a patient reads them: "under a minute", "about 1 minute", "about 4 minutes". */
export function describeMinutes(minutes: number): string {
	if (minutes < 1) return 'under a minute';
	const rounded = Math.round(minutes);
	return `about ${rounded} ${rounded === 1 ? 'minute' : 'minutes'}`;
}
