import { and, eq, isNull } from 'drizzle-orm';
import type { Suggestion } from '../../lib/captions/suggest';
import type { PlannedSegment } from '../../lib/segments/plan';
import { db, schema } from '../../lib/server/db';
import { demoOwner } from './owner';
import { nudgeWorker } from '../../lib/server/jobs';
import { confirmSegments, suggestionsFor } from '../../lib/server/segments';
import { DEMO_CLIPS, type DemoClip } from './clips/scripts';
import { planDemoClip } from './clips/timeline';

/**
 * The demo clip left without segments, so a clinician trying the demo can make them on the
 * segments page themselves. The other clips arrive with their exercises confirmed.
 */
export const UNCONFIRMED_DEMO_CLIP = 'balance-steady-standing';

/** How far a suggestion may sit from the script's boundary and still be taken for it. */
const MATCH_SECONDS = 1;

/**
 * The segments a clinician would confirm for a demo clip: one per exercise, titled as the script
 * titles it, each starting at the suggestion nearest the script's cut (the script's own time when
 * none is near) and ending where the next begins. The introduction before the first is left out.
 */
export function demoSegmentPlan(
	clip: DemoClip,
	suggestions: readonly Pick<Suggestion, 'time'>[],
	durationSeconds: number
): PlannedSegment[] {
	const exercises = planDemoClip(clip).sections.filter((s) => s.kind === 'exercise');
	const starts = exercises.map((section) => {
		const near = suggestions
			.filter((s) => Math.abs(s.time - section.start) <= MATCH_SECONDS)
			.sort((a, b) => Math.abs(a.time - section.start) - Math.abs(b.time - section.start))[0];
		return near ? near.time : section.start;
	});
	return exercises.map((section, i) => ({
		title: section.title,
		start: starts[i],
		end: i + 1 < starts.length ? starts[i + 1] : durationSeconds
	}));
}

async function waitForReady(recordingId: string, timeoutMs: number): Promise<boolean> {
	const until = Date.now() + timeoutMs;
	for (;;) {
		const row = db()
			.select({ status: schema.recordings.status })
			.from(schema.recordings)
			.where(eq(schema.recordings.id, recordingId))
			.get();
		if (!row || row.status === 'failed') return false;
		if (row.status === 'ready') return true;
		if (Date.now() > until) return false;
		await new Promise((r) => setTimeout(r, 1000));
	}
}

/**
 * Confirms segments for the demo recordings from their suggestions, once each recording's web
 * version is ready (the app's worker makes it, so this waits). Recordings that already have
 * segments, and the clip left for the clinician to try, are skipped. The cuts are queued for the
 * app's worker. Answers how many recordings got segments.
 */
export async function confirmDemoSegments(
	clinicianEmail: string,
	log: (line: string) => void = console.log,
	{ timeoutMs = 15 * 60_000 }: { timeoutMs?: number } = {}
): Promise<number> {
	const store = db();
	const owner = demoOwner(clinicianEmail);

	let confirmed = 0;
	for (const clip of DEMO_CLIPS) {
		if (clip.id === UNCONFIRMED_DEMO_CLIP) continue;
		const recording = store
			.select()
			.from(schema.recordings)
			.where(
				and(
					eq(schema.recordings.clinicId, owner.clinicId),
					eq(schema.recordings.originalFilename, `${clip.title}.mp4`)
				)
			)
			.get();
		if (!recording) continue;
		const existing = store
			.select({ id: schema.segments.id })
			.from(schema.segments)
			.where(
				and(eq(schema.segments.recordingId, recording.id), isNull(schema.segments.supersededAt))
			)
			.get();
		if (existing) continue;
		if (!(await waitForReady(recording.id, timeoutMs))) {
			log(`  "${clip.title}" is not ready; its segments were not made`);
			continue;
		}
		const ready = store
			.select()
			.from(schema.recordings)
			.where(eq(schema.recordings.id, recording.id))
			.get()!;
		const answer = await suggestionsFor(ready, { waitMs: timeoutMs });
		if (answer.state !== 'ready') continue;
		const plan = demoSegmentPlan(clip, answer.suggestions, ready.durationSeconds);
		confirmSegments(owner, ready.id, plan);
		nudgeWorker();
		log(`  confirmed ${plan.length} segments of "${clip.title}"; the app is cutting them`);
		confirmed++;
	}
	return confirmed;
}
