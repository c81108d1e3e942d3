import { describe, expect, it } from 'vitest';
import { backgroundPlan, stageReporter } from './engine';

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

describe('progress through stages', () => {
	const STAGES = [
		['cutting', 0.8],
		['posters', 0.1],
		['storing', 0.1]
	] as const;

	function reports(steps: [(typeof STAGES)[number][0], number?][]) {
		const seen: [string, number][] = [];
		const report = stageReporter(
			{ report: (stage, progress) => seen.push([stage, progress]) },
			STAGES
		);
		for (const [stage, fraction] of steps) report(stage, fraction);
		return seen.map(([stage, progress]) => [stage, Math.round(progress * 1000) / 1000]);
	}

	it('counts every stage before this one, then the share of this stage done', () => {
		expect(
			reports([['cutting'], ['cutting', 0.5], ['posters'], ['posters', 0.5], ['storing', 1]])
		).toEqual([
			['cutting', 0],
			['cutting', 0.4],
			['posters', 0.8],
			['posters', 0.85],
			['storing', 1]
		]);
	});

	it('keeps a fraction outside 0..1 inside its own stage', () => {
		expect(
			reports([
				['posters', -2],
				['posters', 7]
			])
		).toEqual([
			['posters', 0.8],
			['posters', 0.9]
		]);
	});
});
