import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { History } from './history.svelte';

function clock() {
	let now = 0;
	return { now: () => now, advance: (ms: number) => (now += ms) };
}

describe('History', () => {
	it('undoes and redoes commits in order', () => {
		const h = new History('a');
		h.commit('b');
		h.commit('c');
		expect(h.canUndo).toBe(true);
		expect(h.canRedo).toBe(false);
		expect(h.undo()).toBe(true);
		expect(h.present).toBe('b');
		expect(h.undo()).toBe(true);
		expect(h.present).toBe('a');
		expect(h.undo()).toBe(false);
		expect(h.redo()).toBe(true);
		expect(h.present).toBe('b');
	});

	it('forgets what could be redone once something new is committed', () => {
		const h = new History(1);
		h.commit(2);
		h.undo();
		h.commit(3);
		expect(h.canRedo).toBe(false);
		h.undo();
		expect(h.present).toBe(1);
	});

	it('makes one entry of typing in the same field while it goes on', () => {
		const c = clock();
		const h = new History('', { now: c.now, groupMs: 1000 });
		for (const text of ['L', 'Li', 'Lif', 'Lift']) {
			h.commit(text, 'text:k1');
			c.advance(300);
		}
		c.advance(2000);
		h.commit('Lift.', 'text:k1');
		h.commit('Lift. ', 'text:k2');
		expect(h.depth).toBe(3);
		h.undo();
		h.undo();
		expect(h.present).toBe('Lift');
		h.undo();
		expect(h.present).toBe('');
	});

	it('starts a new entry after the group is closed', () => {
		const h = new History('', { now: () => 0 });
		h.commit('a', 'text');
		h.closeGroup();
		h.commit('ab', 'text');
		expect(h.depth).toBe(2);
	});

	it('turns a drag into one entry, or none when it ends where it began', () => {
		const h = new History(0);
		h.preview(1);
		h.preview(2);
		h.preview(3);
		expect(h.present).toBe(3);
		h.endPreview();
		expect(h.depth).toBe(1);
		h.undo();
		expect(h.present).toBe(0);

		h.preview(5);
		h.preview(0);
		h.endPreview();
		expect(h.depth).toBe(0);

		h.preview(7);
		h.cancelPreview();
		expect(h.present).toBe(0);
		expect(h.canUndo).toBe(false);
	});

	it('keeps at most `limit` entries, dropping the oldest', () => {
		const h = new History(0, { limit: 3 });
		for (let k = 1; k <= 6; k++) h.commit(k);
		expect(h.depth).toBe(3);
		while (h.undo());
		expect(h.present).toBe(3);
	});

	it('undoing everything and redoing everything returns to the same value', () => {
		fc.assert(
			fc.property(fc.array(fc.integer(), { maxLength: 40 }), (values) => {
				const h = new History(-1, { limit: 1000 });
				for (const v of values) h.commit(v);
				const last = h.present;
				while (h.undo());
				expect(h.present).toBe(-1);
				while (h.redo());
				expect(h.present).toBe(last);
			})
		);
	});

	it('starts afresh on reset', () => {
		const h = new History('a');
		h.commit('b');
		h.reset('z');
		expect([h.present, h.canUndo, h.canRedo]).toEqual(['z', false, false]);
	});
});
