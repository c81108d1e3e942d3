/**
 * Renders the demo clinic's demonstration clips into .data/demo-clips/ (or DEMO_CLIPS_DIR) and
 * prints how long each took; clips whose script has not changed come from the cache at once.
 * `--force` deletes the folder first, for timing a cold render.
 */
import { rm } from 'node:fs/promises';
import { relative, resolve } from 'node:path';
import { ensureDemoClips } from './demo/clips/encoding';

const dir = resolve(process.env.DEMO_CLIPS_DIR ?? '.data/demo-clips');
if (process.argv.includes('--force')) await rm(dir, { recursive: true, force: true });

const began = performance.now();
let lastShown = -1;
const results = await ensureDemoClips(dir, {
	onProgress: (clip, fraction) => {
		const tenth = Math.floor(fraction * 10);
		// Only a line per tenth, so a log file stays readable.
		if (tenth !== lastShown && process.stdout.isTTY) {
			lastShown = tenth;
			process.stdout.write(`\r${clip.id}: ${tenth * 10}%   `);
		}
	}
});
if (process.stdout.isTTY) process.stdout.write('\r');

for (const r of results) {
	const speed = r.durationSeconds / r.seconds;
	console.log(
		`${r.clip.id}: ${r.durationSeconds.toFixed(1)} s of video, ${r.cues.length} cues, ` +
			(r.rendered
				? `rendered in ${r.seconds.toFixed(1)} s (${speed.toFixed(1)}× real time)`
				: 'cached') +
			` → ${relative(process.cwd(), r.path)}`
	);
}
console.log(`Done in ${((performance.now() - began) / 1000).toFixed(1)} s.`);
