/**
 * The set and rep counter on the replay screen, as pure state changes with the words a screen
 * reader announces. A set completes by itself when its last rep is counted; "minus" on the first
 * rep of a set reopens the set before it, so a slip of the finger is undone with one key.
 */

export interface CounterState {
	targetSets: number;
	targetReps: number;
	/** Reps counted in each completed set. */
	completed: number[];
	/** Reps counted in the set under way. */
	reps: number;
}

export type CounterEvent = 'rep' | 'unrep' | 'set-done' | 'all-done' | 'nothing';

export interface CounterStep {
	state: CounterState;
	event: CounterEvent;
}

export function startCounter(targetSets: number, targetReps: number): CounterState {
	return { targetSets, targetReps, completed: [], reps: 0 };
}

export function allSetsDone(s: CounterState): boolean {
	return s.completed.length >= s.targetSets;
}

/** The set under way, counting from 1 (or the last set once all are done). */
export function currentSet(s: CounterState): number {
	return Math.min(s.completed.length + 1, s.targetSets);
}

function closeSet(s: CounterState, reps: number): CounterStep {
	const state = { ...s, completed: [...s.completed, reps], reps: 0 };
	return { state, event: allSetsDone(state) ? 'all-done' : 'set-done' };
}

/** One more rep; the set's last rep completes the set. Nothing happens once all sets are done. */
export function addRep(s: CounterState): CounterStep {
	if (allSetsDone(s)) return { state: s, event: 'nothing' };
	const reps = s.reps + 1;
	if (reps >= s.targetReps) return closeSet(s, reps);
	return { state: { ...s, reps }, event: 'rep' };
}

/** One rep fewer; at the start of a set, reopens the set before it one rep short. */
export function removeRep(s: CounterState): CounterStep {
	if (s.reps > 0) return { state: { ...s, reps: s.reps - 1 }, event: 'unrep' };
	if (s.completed.length === 0) return { state: s, event: 'nothing' };
	const last = s.completed[s.completed.length - 1];
	return {
		state: { ...s, completed: s.completed.slice(0, -1), reps: Math.max(0, last - 1) },
		event: 'unrep'
	};
}

/** Ends the set under way early (a set with no reps yet cannot end). */
export function finishSet(s: CounterState): CounterStep {
	if (allSetsDone(s) || s.reps === 0) return { state: s, event: 'nothing' };
	return closeSet(s, s.reps);
}

/** What the counter says out loud after `event`, e.g. "Rep 4 of 10, set 2 of 3." */
export function announce(s: CounterState, event: CounterEvent, restSeconds = 0): string {
	const setWord = `set ${currentSet(s)} of ${s.targetSets}`;
	switch (event) {
		case 'rep':
		case 'unrep':
			return `Rep ${s.reps} of ${s.targetReps}, ${setWord}.`;
		case 'set-done': {
			const rest = restSeconds > 0 ? ` Rest ${restSeconds} seconds.` : '';
			return `Set ${s.completed.length} of ${s.targetSets} done.${rest} Next: ${setWord}.`;
		}
		case 'all-done':
			return `All ${s.targetSets} ${s.targetSets === 1 ? 'set' : 'sets'} done. Press Done to log this session.`;
		case 'nothing':
			return allSetsDone(s)
				? `All ${s.targetSets} ${s.targetSets === 1 ? 'set' : 'sets'} are done. Press Done to log this session.`
				: `Rep ${s.reps} of ${s.targetReps}, ${setWord}.`;
	}
}

/**
 * What the logging step starts from: sets with any reps (a part-done set counts), and reps in
 * each set as the rounded average of those sets. The patient can change both before saving.
 */
export function countsToLog(s: CounterState): { setsDone: number; repsDone: number } {
	const sets = s.reps > 0 ? [...s.completed, s.reps] : s.completed;
	if (sets.length === 0) return { setsDone: 0, repsDone: 0 };
	const total = sets.reduce((sum, n) => sum + n, 0);
	return { setsDone: sets.length, repsDone: Math.round(total / sets.length) };
}
