/**
 * The numbers each follow-up chart draws, built once so that the chart and its table (the text
 * alternative) can never disagree.
 */
import type { AdherenceWindow } from '../clinical/adherence';
import { PAIN_IMPORTANT_CHANGE } from '../clinical/pain';
import type { RomRow } from './rom-table';
import { formatShortDate } from './words';

export interface Series {
	label: string;
	data: (number | null)[];
	tone: 'lichen' | 'berry' | 'dusk' | 'ochre' | 'slate' | 'ember';
	style?: 'solid' | 'dashed' | 'dotted';
	point?: 'circle' | 'rect' | 'triangle' | 'rectRot' | 'crossRot';
}

export interface ChartData {
	labels: string[];
	/** The labels' dates, for a time axis spaced by days. */
	dates?: string[];
	series: Series[];
}

/** Adherence per calendar week, as a percentage (null for a week with nothing prescribed). */
export function adherenceChart(
	weeks: readonly { weekStart: string; window: AdherenceWindow }[]
): ChartData {
	return {
		labels: weeks.map((w) => `w/c ${formatShortDate(w.weekStart)}`),
		series: [{ label: 'Adherence (%)', data: weeks.map((w) => w.window.percent), tone: 'lichen' }]
	};
}

/** Each day's average pain, with the baseline and the level that would raise a flag. */
export function painChart(
	days: readonly { date: string; average: number }[],
	baseline: number | null
): ChartData {
	const series: Series[] = [
		{
			label: 'Average pain that day (0–10)',
			data: days.map((d) => Math.round(d.average * 10) / 10),
			tone: 'berry',
			point: 'circle'
		}
	];
	if (baseline !== null) {
		series.push(
			{
				label: `Baseline, earlier 7 days (${baseline.toFixed(1)})`,
				data: days.map(() => Math.round(baseline * 10) / 10),
				tone: 'slate',
				style: 'dashed',
				point: 'rect'
			},
			{
				label: `Flag level, baseline + ${PAIN_IMPORTANT_CHANGE}`,
				data: days.map(() =>
					Math.min(10, Math.round((baseline + PAIN_IMPORTANT_CHANGE) * 10) / 10)
				),
				tone: 'ochre',
				style: 'dotted',
				point: 'triangle'
			}
		);
	}
	return {
		labels: days.map((d) => formatShortDate(d.date)),
		dates: days.map((d) => d.date),
		series
	};
}

const SIDE_STYLE: Record<string, Pick<Series, 'tone' | 'point'>> = {
	left: { tone: 'dusk', point: 'circle' },
	right: { tone: 'lichen', point: 'rect' }
};

/** One chart per motion: a line per side and mode, and the chosen table's normal value. */
export function romCharts(
	rows: readonly RomRow[]
): { motion: string; motionLabel: string; chart: ChartData; rows: RomRow[] }[] {
	const motions = [...new Set(rows.map((r) => r.motion))];
	return motions.map((motion) => {
		const mine = rows.filter((r) => r.motion === motion);
		const dates = [...new Set(mine.map((r) => r.measuredOn))].sort();
		const keys = [...new Set(mine.map((r) => `${r.side}|${r.mode}`))].sort();
		const series: Series[] = keys.map((key) => {
			const [side, mode] = key.split('|');
			const data = dates.map((date) => {
				const reading = mine
					.filter((r) => r.side === side && r.mode === mode && r.measuredOn === date)
					.at(-1);
				return reading ? reading.degrees : null;
			});
			return {
				label: `${side[0].toUpperCase()}${side.slice(1)}, ${mode} (°)`,
				data,
				...(SIDE_STYLE[side] ?? SIDE_STYLE.left),
				style: mode === 'passive' ? 'dashed' : 'solid'
			};
		});
		const normal = mine.find((r) => r.normal)?.normal?.normal;
		if (normal) {
			series.push({
				label: `${normal.sourceName} normal (${normal.degrees}°)`,
				data: dates.map(() => normal.degrees),
				tone: 'slate',
				style: 'dotted',
				point: 'crossRot'
			});
		}
		return {
			motion,
			motionLabel: mine[0].motionLabel,
			chart: { labels: dates.map(formatShortDate), dates, series },
			rows: mine
		};
	});
}
