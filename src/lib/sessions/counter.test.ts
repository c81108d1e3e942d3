import { describe, expect, it } from 'vitest';
import {
	addRep,
	allSetsDone,
	announce,
	countsToLog,
	currentSet,
	finishSet,
	removeRep,
	startCounter,
	type CounterState
} from './counter';

function repeat(s: CounterState, times: number, step = addRep): CounterState {
	for (let i = 0; i < times; i++) s = step(s).state;
	return s;
}

describe('the set and rep counter', () => {
	it('counts reps and completes a set on its last rep, announcing the rest', () => {
		let s = startCounter(2, 3);
		s = repeat(s, 2);
		expect(announce(s, 'rep')).toBe('Rep 2 of 3, set 1 of 2.');
		const step = addRep(s);
		expect(step.event).toBe('set-done');
		expect(step.state).toMatchObject({ completed: [3], reps: 0 });
		expect(announce(step.state, step.event, 30)).toBe(
			'Set 1 of 2 done. Rest 30 seconds. Next: set 2 of 2.'
		);
	});

	it('says all sets are done and then counts no further', () => {
		let s = repeat(startCounter(1, 2), 1);
		const last = addRep(s);
		expect(last.event).toBe('all-done');
		expect(announce(last.state, 'all-done')).toBe(
			'All 1 set done. Press Done to log this session.'
		);
		s = last.state;
		expect(allSetsDone(s)).toBe(true);
		const extra = addRep(s);
		expect(extra.event).toBe('nothing');
		expect(extra.state).toBe(s);
		expect(announce(s, 'nothing')).toContain('are done');
		expect(currentSet(s)).toBe(1);
	});

	it('undoes a rep, and at the start of a set reopens the previous set one short', () => {
		let s = repeat(startCounter(3, 2), 2);
		expect(s).toMatchObject({ completed: [2], reps: 0 });
		s = removeRep(s).state;
		expect(s).toMatchObject({ completed: [], reps: 1 });
		s = repeat(s, 2, removeRep);
		expect(s).toMatchObject({ completed: [], reps: 0 });
		expect(removeRep(s).event).toBe('nothing');
	});

	it('ends a set early only when it has reps', () => {
		let s = startCounter(3, 10);
		expect(finishSet(s).event).toBe('nothing');
		s = repeat(s, 4);
		const step = finishSet(s);
		expect(step.event).toBe('set-done');
		expect(step.state.completed).toEqual([4]);
	});

	it('starts the log from sets with reps and the average reps per set', () => {
		expect(countsToLog(startCounter(2, 10))).toEqual({ setsDone: 0, repsDone: 0 });
		let s = repeat(startCounter(3, 10), 20);
		expect(countsToLog(s)).toEqual({ setsDone: 2, repsDone: 10 });
		s = repeat(s, 5);
		// 10, 10 and a part-done 5: three sets, about 8 reps each.
		expect(countsToLog(s)).toEqual({ setsDone: 3, repsDone: 8 });
	});
});
