/**
 * A session log as the patient's device sends it (POST /api/sessions). The device makes the
 * `clientId`, so a log sent twice — a retry after a dropped connection, or the offline queue
 * sending again — is stored once. Shared by the replay screen, the offline queue and the server.
 */
import { z } from 'zod';

/** Lower-case UUIDs, as crypto.randomUUID() makes them and as the id route matcher accepts. */
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

export const MAX_SETS_DONE = 20;
export const MAX_REPS_DONE = 200;
export const MAX_NOTE_LENGTH = 1000;

/** Words at the anchors of the 0–10 numeric rating scale, as the logging step shows them. */
export const PAIN_ANCHORS: Record<number, string> = {
	0: 'No pain',
	5: 'Moderate pain',
	10: 'Worst pain imaginable'
};

const whole = (what: string, max: number) =>
	z
		.number({ error: `${what} must be a number.` })
		.int(`${what} must be a whole number.`)
		.min(0, `${what} cannot be below 0.`)
		.max(max, `${what} can be at most ${max}.`);

export const sessionLogSchema = z.object({
	clientId: z.string().regex(UUID, 'The log needs the id the device made for it.'),
	programmeItemId: z.string().regex(UUID, 'Which exercise was this? The exercise id is missing.'),
	/** When the patient pressed "done", on their device's clock (ISO 8601 with an offset or Z). */
	doneAt: z.iso.datetime({ offset: true, error: 'The time of the session is missing or unclear.' }),
	setsDone: whole('Sets done', MAX_SETS_DONE),
	/** Repetitions in each set (the prescription's "reps" counts per set too). */
	repsDone: whole('Reps in each set', MAX_REPS_DONE),
	/** 0–10 on the numeric rating scale. */
	pain: whole('Pain', 10),
	/** The patient ticked "sharp or new pain": the clinician is told at once. */
	sharpPain: z.boolean({ error: 'Sharp or new pain is a yes or no.' }).default(false),
	note: z
		.string()
		.max(MAX_NOTE_LENGTH, `A note can be at most ${MAX_NOTE_LENGTH} characters.`)
		.default('')
		.transform((note) => note.trim())
});

export type SessionLogInput = z.input<typeof sessionLogSchema>;
export type SessionLogData = z.output<typeof sessionLogSchema>;

/** What the endpoint answers for a stored log (also when it was already stored). */
export interface StoredSessionLog {
	id: string;
	clientId: string;
	programmeItemId: string;
	doneAt: string;
	localDate: string;
	setsDone: number;
	repsDone: number;
	pain: number;
	sharpPain: boolean;
	note: string;
}

export interface SessionLogResponse {
	log: StoredSessionLog;
	/** False when a log with this clientId was already stored (the earlier one is returned). */
	created: boolean;
}
