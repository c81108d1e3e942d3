import { describe, expect, it } from 'vitest';
import { adherence } from '../clinical/adherence';
import { adherenceChart, painChart, romCharts } from './charts';
import { romRows } from './rom-table';

describe('the numbers each chart draws', () => {
	it('draws weekly adherence as percentages, nothing for a week without sessions', () => {
		const schedule = { startDate: '2026-11-09', endDate: null, sessionsPerDay: 1, daysPerWeek: 7 };
		const chart = adherenceChart([
			{ weekStart: '2026-11-02', window: adherence(schedule, [], '2026-11-08', 7) },
			{ weekStart: '2026-11-09', window: adherence(schedule, ['2026-11-10'], '2026-11-15', 7) }
		]);
		expect(chart.labels).toEqual(['w/c 2 Nov', 'w/c 9 Nov']);
		expect(chart.series[0].data).toEqual([null, 14]);
	});

	it('draws daily pain with the baseline and the flag level 2 points above it (Farrar et al., Pain 2001)', () => {
		const chart = painChart(
			[
				{ date: '2026-11-02', average: 2.25 },
				{ date: '2026-11-09', average: 4 }
			],
			2.25
		);
		expect(chart.dates).toEqual(['2026-11-02', '2026-11-09']);
		expect(chart.series.map((s) => s.data)).toEqual([
			[2.3, 4],
			[2.3, 2.3],
			[4.3, 4.3]
		]);
		expect(painChart([{ date: '2026-11-02', average: 3 }], null).series).toHaveLength(1);
	});

	it('draws one chart per motion, a line per side and mode, and the normal value', () => {
		const rows = romRows(
			[
				{
					id: 'a',
					motion: 'knee-flexion',
					side: 'left',
					mode: 'active',
					degrees: 90,
					measuredOn: '2026-11-02',
					note: '',
					instrument: 'goniometer',
					armPosition: null
				},
				{
					id: 'b',
					motion: 'knee-flexion',
					side: 'right',
					mode: 'active',
					degrees: 130,
					measuredOn: '2026-11-02',
					note: '',
					instrument: 'goniometer',
					armPosition: null
				},
				{
					id: 'c',
					motion: 'knee-flexion',
					side: 'left',
					mode: 'active',
					degrees: 100,
					measuredOn: '2026-11-16',
					note: '',
					instrument: 'goniometer',
					armPosition: null
				},
				{
					id: 'd',
					motion: 'knee-extension',
					side: 'left',
					mode: 'active',
					degrees: -5,
					measuredOn: '2026-11-16',
					note: '',
					instrument: 'goniometer',
					armPosition: null
				}
			],
			{ source: 'aaos', affectedSide: 'left' }
		);
		const charts = romCharts(rows);
		expect(charts.map((c) => c.motion)).toEqual(['knee-flexion', 'knee-extension']);
		const flexion = charts[0].chart;
		expect(flexion.dates).toEqual(['2026-11-02', '2026-11-16']);
		expect(flexion.series.map((s) => [s.label, s.data])).toEqual([
			['Left, active (°)', [90, 100]],
			['Right, active (°)', [130, null]],
			['AAOS normal (135°)', [135, 135]]
		]);
	});
});
