/**
 * `npm run bench:drafts`: how well exercise drafts match the expected answers of the invented
 * narration scripts (src/lib/authoring/scripts), as precision and recall per field, for the
 * training scripts and the held-out check scripts apart. The check scripts were never used to
 * tune the vocabulary, so their figures are the fairer estimate. A measurement, not a test: it
 * exits 0 whatever the figures are.
 */
import { scoreDrafts, DRAFT_FIELDS, type FieldScore } from '../lib/authoring/accuracy';
import { draftExercise } from '../lib/authoring/exercise-draft';
import { NARRATIONS, type NarrationScript } from '../lib/authoring/scripts/narrations';

function scoresOf(scripts: readonly NarrationScript[]) {
	return scoreDrafts(scripts.map((s) => ({ draft: draftExercise(s.cues), expected: s.expected })));
}

const percent = (ratio: number | null) => (ratio === null ? '—' : `${Math.round(ratio * 100)}%`);
const counts = (s: FieldScore) =>
	`${s.truePositives}/${s.falsePositives}/${s.falseNegatives}/${s.trueNegatives}`;

function main(): void {
	const training = NARRATIONS.filter((n) => n.set === 'training');
	const check = NARRATIONS.filter((n) => n.set === 'check');
	const trainingScores = scoresOf(training);
	const checkScores = scoresOf(check);

	const header = [
		'field',
		'train P',
		'train R',
		'TP/FP/FN/TN',
		'check P',
		'check R',
		'TP/FP/FN/TN'
	];
	const rows = DRAFT_FIELDS.map((field) => {
		const t = trainingScores[field];
		const c = checkScores[field];
		return [
			field,
			percent(t.precision),
			percent(t.recall),
			counts(t),
			percent(c.precision),
			percent(c.recall),
			counts(c)
		];
	});
	const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
	const line = (cells: string[]) =>
		cells
			.map((cell, i) => (i === 0 ? cell.padEnd(widths[i]) : cell.padStart(widths[i])))
			.join('  ');

	console.log(`Exercise drafts from narration: ${NARRATIONS.length} scripts`);
	console.log(`(${training.length} training, ${check.length} held-out check)\n`);
	console.log(line(header));
	console.log(widths.map((w) => '-'.repeat(w)).join('  '));
	for (const row of rows) console.log(line(row));
	console.log(
		'\nP = precision (right proposals / all proposals), R = recall (right proposals / right + missed);' +
			'\n— where the ratio has no denominator. Equipment and safety notes count each item.'
	);
}

main();
