import { describe, expect, it } from 'vitest';
import { howToMove } from './how-to-move';

// Common practice after a rotator cuff repair: in passive exercises the good arm moves the
// operated one (often with a stick) and the operated side's muscles stay relaxed.
describe('how to move, in plain words', () => {
	it('says the other arm does the work in a passive shoulder exercise, and which arm is treated', () => {
		expect(
			howToMove({
				movementType: 'passive',
				bodyRegion: 'Shoulder',
				side: 'either',
				affectedSide: 'right'
			})
		).toEqual({
			side: 'Your right arm — the one being treated.',
			movement: 'Your other arm does the work; keep the arm being treated relaxed.'
		});
	});

	it('tells active-assisted, active and resisted apart', () => {
		const say = (movementType: 'active-assisted' | 'active' | 'resisted') =>
			howToMove({ movementType, bodyRegion: 'Knee', side: 'left', affectedSide: 'left' }).movement;
		expect(say('active-assisted')).toMatch(/helps; the leg being treated does part/);
		expect(say('active')).toBe('You make the movement yourself, without help.');
		expect(say('resisted')).toMatch(/against the band or weight/);
	});

	it('names a side only where it means something, and never an internal word', () => {
		const side = (s: 'left' | 'right' | 'both' | 'either' | 'not applicable', affected = 'left') =>
			howToMove({ movementType: 'active', bodyRegion: 'Knee', side: s, affectedSide: affected })
				.side;
		expect(side('left')).toBe('Your left leg — the one being treated.');
		expect(side('right')).toBe('Your right leg.');
		expect(side('both')).toBe('Both legs.');
		expect(side('either', 'not applicable')).toBe('Either leg.');
		expect(side('not applicable')).toBeNull();
		expect(
			howToMove({
				movementType: 'active',
				bodyRegion: 'Balance',
				side: 'either',
				affectedSide: 'right'
			}).side
		).toBe('Your right side — the one being treated.');
	});
});
