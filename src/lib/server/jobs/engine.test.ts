import { describe, expect, it } from 'vitest';
import { backgroundPlan } from './engine';

describe('who runs the background work', () => {
	it('with SQLite, the worker process does it all and the app only when it runs the worker', () => {
		expect(backgroundPlan('worker', 'sqlite', false)).toEqual({
			worker: true,
			dispatcher: false,
			upkeep: true
		});
		expect(backgroundPlan('app', 'sqlite', false)).toEqual({
			worker: false,
			dispatcher: false,
			upkeep: false
		});
		expect(backgroundPlan('app', 'sqlite', true)).toEqual({
			worker: true,
			dispatcher: false,
			upkeep: true
		});
	});

	it('with BullMQ, the app alone touches the database and workers only run jobs', () => {
		expect(backgroundPlan('worker', 'bullmq', false)).toEqual({
			worker: true,
			dispatcher: false,
			upkeep: false
		});
		expect(backgroundPlan('app', 'bullmq', false)).toEqual({
			worker: false,
			dispatcher: true,
			upkeep: true
		});
		expect(backgroundPlan('app', 'bullmq', true).worker).toBe(true);
	});
});
