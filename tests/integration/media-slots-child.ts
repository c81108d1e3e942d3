/**
 * One process of the ffmpeg-limit test (media-slots.test.ts): at START_AT (ms since the epoch)
 * it starts RUNS ffmpeg runs at once through the app's own runner. FFMPEG_PATH points at a fake
 * that only notes how many runs are going on and waits a moment.
 */
import { closeDatabase, db } from '../../src/lib/server/db';
import { runFfmpeg } from '../../src/lib/server/media/ffmpeg';

db();
const startAt = Number(process.env.START_AT ?? 0);
while (Date.now() < startAt) await new Promise((resolve) => setTimeout(resolve, 5));
const runs = Number(process.env.RUNS ?? 1);
await Promise.all(
	Array.from({ length: runs }, () => runFfmpeg(['-i', 'fake-input.mp4', '-f', 'null', '-']))
);
closeDatabase();
