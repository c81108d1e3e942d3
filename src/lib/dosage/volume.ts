/** Weekly volume of one exercise's dosage: plain products of its counts. */
import type { Dosage } from './types';

/** Sessions in a week: sessions a day × days a week. */
export function sessionsPerWeek(d: Pick<Dosage, 'sessionsPerDay' | 'daysPerWeek'>): number {
	return d.sessionsPerDay * d.daysPerWeek;
}

/** Repetitions in one session: sets × reps. */
export function repsPerSession(d: Pick<Dosage, 'sets' | 'reps'>): number {
	return d.sets * d.reps;
}

/** Repetitions in a week: sets × reps × sessions a day × days a week. */
export function repsPerWeek(d: Dosage): number {
	return repsPerSession(d) * sessionsPerWeek(d);
}

/** Seconds spent holding in one session: sets × reps × hold (flexibility guidance counts this). */
export function holdSecondsPerSession(d: Pick<Dosage, 'sets' | 'reps' | 'holdSeconds'>): number {
	return repsPerSession(d) * d.holdSeconds;
}

/** Everything above at once, for a programme table row. */
export interface WeeklyVolume {
	sessionsPerWeek: number;
	repsPerSession: number;
	repsPerWeek: number;
	holdSecondsPerSession: number;
}

/** The weekly volume of a dosage. */
export function weeklyVolume(d: Dosage): WeeklyVolume {
	return {
		sessionsPerWeek: sessionsPerWeek(d),
		repsPerSession: repsPerSession(d),
		repsPerWeek: repsPerWeek(d),
		holdSecondsPerSession: holdSecondsPerSession(d)
	};
}
