import { open, stat } from 'node:fs/promises';
import { and, eq } from 'drizzle-orm';
import { db, schema } from '../../lib/server/db';
import { demoOwner } from './owner';
import { createTrack, saveVersion } from '../../lib/server/captions';
import { completeUpload, createUpload, presignParts } from '../../lib/server/recordings/uploads';
import { ensureDemoClips } from './clips/encoding';

/**
 * Brings the generated demo clips into the demo clinic exactly as a clinician's browser would:
 * a multipart upload through presigned part URLs, then completion, which probes, validates and
 * queues the processing job that the app's worker runs; each gets its narration as a captions
 * track. Clips already present are skipped.
 */
export async function seedDemoRecordings(
	clipsDir: string,
	clinicianEmail: string,
	log: (line: string) => void = console.log
): Promise<number> {
	const store = db();
	const owner = demoOwner(clinicianEmail);

	const clips = await ensureDemoClips(clipsDir);
	let added = 0;
	for (const { clip, path, rendered, seconds, cues } of clips) {
		if (rendered) log(`  drew "${clip.title}" in ${seconds.toFixed(1)} s`);
		const filename = `${clip.title}.mp4`;
		const present = store
			.select({ id: schema.recordings.id })
			.from(schema.recordings)
			.where(
				and(
					eq(schema.recordings.clinicId, owner.clinicId),
					eq(schema.recordings.originalFilename, filename)
				)
			)
			.get();
		if (present) continue;
		const { size } = await stat(path);
		const session = await createUpload(owner, {
			filename,
			contentType: 'video/mp4',
			sizeBytes: size
		});
		const numbers = Array.from({ length: session.partCount }, (_, i) => i + 1);
		const urls = await presignParts(owner, session.id, numbers);
		const file = await open(path);
		try {
			for (const { partNumber, url } of urls) {
				const start = (partNumber - 1) * session.partSize;
				const length = Math.min(session.partSize, size - start);
				const buffer = Buffer.alloc(length);
				await file.read(buffer, 0, length, start);
				const response = await fetch(url, { method: 'PUT', body: buffer });
				if (!response.ok) throw new Error(`Storage refused part ${partNumber}: ${response.status}`);
			}
		} finally {
			await file.close();
		}
		const recording = await completeUpload(owner, session.id);
		// The clip's narration, timed as it was drawn, becomes its first captions track.
		const track = createTrack(recording, { kind: 'captions', language: 'en-GB' });
		saveVersion(track, {
			baseVersion: 0,
			cues: cues.map((cue, i) => ({
				id: String(i + 1),
				start: cue.start,
				end: cue.end,
				text: cue.text
			})),
			note: 'Narration script of the demo clip',
			source: 'generated',
			userId: owner.id
		});
		added++;
	}
	return added;
}
