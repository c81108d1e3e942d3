import { fakesDirectory, testEnv } from './env';
import { join } from 'node:path';
import { beforeAll, describe, expect, it, vi } from 'vitest';
import { eq } from 'drizzle-orm';

// A database of this file's own.
process.env.DATABASE_PATH = join(fakesDirectory, `media-redirect-${process.pid}.db`);

type Principal = import('$lib/server/auth/principal').Principal;

// Endpoints read their caller from the request, as in the app; here the test names the caller.
let caller: Principal | null = null;
vi.mock('$app/server', () => ({
	getRequestEvent: () => ({ locals: { user: caller } })
}));

const { db, schema } = await import('$lib/server/db');
const { putObject } = await import('$lib/server/storage');
const { recordingKeys } = await import('$lib/server/storage/keys');
const { presignMediaUrl } = await import('$lib/server/storage/media-urls');
const { config } = await import('$lib/server/config');
const submissions = await import('$lib/server/library/submissions');
const publishing = await import('$lib/server/library/publishing');
const support = await import('./library-support');
const factories = await import('./factories');
const segmentClip = await import('../../src/routes/api/segments/[id=id]/clip.mp4/+server');
const segmentPoster = await import('../../src/routes/api/segments/[id=id]/poster-[n].jpg/+server');
const recordingMedia = await import(
	'../../src/routes/api/recordings/[id=id]/media/[asset]/+server'
);
const versionClip = await import('../../src/routes/api/library/versions/[id=id]/clip.mp4/+server');
const versionPoster = await import(
	'../../src/routes/api/library/versions/[id=id]/poster-[n].jpg/+server'
);
const submissionClip = await import(
	'../../src/routes/api/library/submissions/[id=id]/clip.mp4/+server'
);

type World = import('./library-support').World;
type Segment = Awaited<ReturnType<typeof support.makeSegment>>;

/*
 * Media bytes go from storage to the browser: each media request is still authorised by
 * Kinelume (role, clinic, the patient's own programme, the library's status) and answered with
 * a redirect to a short-lived presigned storage URL (RFC 9110 §15.4.8, 307 Temporary Redirect).
 */

let world: World;
let other: World;
let segment: Segment;
let otherSegment: Segment;
let viewer: Principal;
let outsider: Principal;

function principal(
	person: { id: string; email: string; name?: string },
	role: Principal['role'],
	clinicId: string,
	patientId: string | null = null
): Principal {
	return {
		id: person.id,
		email: person.email,
		name: person.name ?? 'Test person',
		role,
		clinicId,
		clinicName: 'Test clinic',
		patientId,
		timeZone: 'Europe/London'
	};
}

const clinicianOf = (w: World) => principal(w.clinician, 'clinician', w.clinicId);
const educatorOf = (w: World) => principal(w.educator, 'educator', w.clinicId);

/** A patient of the world's clinic, with a published programme using `segmentId` if given. */
function makePatient(w: World, segmentId?: string): Principal {
	const patient = factories.makePatient(w.clinicId, 'Test patient', {
		emailDomain: 'media-redirect.example'
	});
	if (segmentId) {
		const exercise = factories.makeExercise(w.clinicId, 'Heel slides', { segmentId });
		factories.makeProgramme(patient, [exercise.id], { startDate: '2026-11-02' });
	}
	return principal(
		{ id: crypto.randomUUID(), email: patient.email },
		'patient',
		w.clinicId,
		patient.id
	);
}

type Handler = (event: never) => Response | Promise<Response>;

/** Calls an endpoint as the app would, as `who`. */
async function call(
	handler: Handler,
	params: Record<string, string>,
	who: Principal | null,
	init: RequestInit = {},
	query = ''
): Promise<Response> {
	caller = who;
	const request = new Request(`http://kinelume.test/api/media${query}`, init);
	return handler({ params, request } as never);
}

/** Follows a redirect to storage as a browser would, sending the same Range. */
function follow(response: Response, range?: string): Promise<Response> {
	const location = response.headers.get('location');
	if (!location) throw new Error(`no Location on a ${response.status} answer`);
	return fetch(location, { headers: range ? { Range: range } : {} });
}

beforeAll(async () => {
	world = support.makeWorld('Redirect clinic');
	other = support.makeWorld('Another redirect clinic');
	segment = await support.makeSegment(world);
	otherSegment = await support.makeSegment(other);
	viewer = makePatient(world, segment.id);
	outsider = makePatient(world);
});

describe('a segment’s clip and posters', () => {
	it('redirects the clinic’s clinician to a short-lived storage URL that honours ranges', async () => {
		const response = await call(segmentClip.GET, { id: segment.id }, clinicianOf(world), {
			headers: { Range: 'bytes=2-5' }
		});
		expect(response.status).toBe(307);
		expect(response.headers.get('cache-control')).toBe('private, no-store');
		const location = new URL(response.headers.get('location')!);
		expect(location.origin).toBe(new URL(testEnv.S3_ENDPOINT).origin);
		expect(location.searchParams.get('X-Amz-Expires')).toBe(
			String(config().MEDIA_URL_LIFETIME_SECONDS)
		);
		const stored = await follow(response, 'bytes=2-5');
		expect(stored.status).toBe(206);
		expect(stored.headers.get('content-range')).toBe(`bytes 2-5/${support.CLIP_BYTES.length}`);
		expect(stored.headers.get('content-type')).toBe('video/mp4');
		expect(new Uint8Array(await stored.arrayBuffer())).toEqual(support.CLIP_BYTES.subarray(2, 6));
	});

	it('keeps another clinic’s clip a 404, with no storage address', async () => {
		const response = await call(segmentClip.GET, { id: otherSegment.id }, clinicianOf(world));
		expect(response.status).toBe(404);
		expect(response.headers.get('location')).toBeNull();
	});

	it('lets a patient reach it only through a published programme of their own', async () => {
		expect((await call(segmentClip.GET, { id: segment.id }, viewer)).status).toBe(307);
		expect((await call(segmentPoster.GET, { id: segment.id, n: '0' }, viewer)).status).toBe(307);
		for (const who of [outsider, makePatient(other, otherSegment.id)]) {
			const response = await call(segmentClip.GET, { id: segment.id }, who);
			expect(response.status).toBe(404);
			expect(response.headers.get('location')).toBeNull();
		}
	});

	it('refuses the signed out (401) and other roles (403) without a storage address', async () => {
		const signedOut = await call(segmentClip.GET, { id: segment.id }, null);
		expect(signedOut.status).toBe(401);
		const educator = await call(segmentClip.GET, { id: segment.id }, educatorOf(world));
		expect(educator.status).toBe(403);
		expect(educator.headers.get('location')).toBeNull();
	});

	it('redirects a poster, which storage serves as a JPEG', async () => {
		const response = await call(segmentPoster.GET, { id: segment.id, n: '1' }, clinicianOf(world));
		expect(response.status).toBe(307);
		const stored = await follow(response);
		expect(stored.status).toBe(200);
		expect(stored.headers.get('content-type')).toBe('image/jpeg');
		expect(new Uint8Array(await stored.arrayBuffer())).toEqual(support.POSTER_BYTES);
		const missing = await call(segmentPoster.GET, { id: segment.id, n: '5' }, clinicianOf(world));
		expect(missing.status).toBe(404);
	});

	it('answers HEAD and a matching If-None-Match itself, moving no bytes', async () => {
		const head = await call(segmentClip.GET, { id: segment.id }, clinicianOf(world), {
			method: 'HEAD'
		});
		expect(head.status).toBe(200);
		expect(head.headers.get('location')).toBeNull();
		expect(head.headers.get('content-length')).toBe(String(support.CLIP_BYTES.length));
		const etag = head.headers.get('etag')!;
		expect(etag).toMatch(/^"/);
		const again = await call(segmentClip.GET, { id: segment.id }, clinicianOf(world), {
			headers: { 'If-None-Match': etag }
		});
		expect(again.status).toBe(304);
		expect(again.headers.get('location')).toBeNull();
	});
});

describe('a recording’s media', () => {
	async function recordingOf(w: World): Promise<string> {
		const recording = db()
			.select()
			.from(schema.recordings)
			.all()
			.find((r) => r.clinicId === w.clinicId)!;
		const keys = recordingKeys(w.clinicId, recording.id);
		await putObject(keys.rendition, support.CLIP_BYTES, 'video/mp4');
		await putObject(keys.waveform, '{"peaks":[]}', 'application/json');
		return recording.id;
	}

	it('redirects the rendition for its clinic only; the waveform (read by script) stays in the app', async () => {
		const id = await recordingOf(world);
		const mine = await call(recordingMedia.GET, { id, asset: 'rendition.mp4' }, clinicianOf(world));
		expect(mine.status).toBe(307);
		expect(mine.headers.get('cache-control')).toBe('private, no-store');
		expect((await follow(mine, 'bytes=0-0')).status).toBe(206);
		const theirs = await call(
			recordingMedia.GET,
			{ id, asset: 'rendition.mp4' },
			clinicianOf(other)
		);
		expect(theirs.status).toBe(404);
		expect(theirs.headers.get('location')).toBeNull();
		const waveform = await call(
			recordingMedia.GET,
			{ id, asset: 'waveform.json' },
			clinicianOf(world)
		);
		expect(waveform.status).toBe(200);
		expect(await waveform.text()).toBe('{"peaks":[]}');
		const patient = await call(recordingMedia.GET, { id, asset: 'rendition.mp4' }, viewer);
		expect(patient.status).toBe(403);
	});
});

describe('storage refuses a presigned URL', () => {
	it('once its lifetime is over, and when it was altered', async () => {
		const key = recordingKeys(world.clinicId, segment.recordingId).segment(segment.id);
		const fresh = await presignMediaUrl(key, { contentType: 'video/mp4', audience: 'private' });
		expect((await fetch(fresh.url)).status).toBe(200);
		const old = await presignMediaUrl(key, {
			contentType: 'video/mp4',
			audience: 'private',
			now: Date.now() - 2 * config().MEDIA_URL_LIFETIME_SECONDS * 1000
		});
		const expired = await fetch(old.url);
		expect(expired.status).toBe(403);
		expect(await expired.text()).toContain('expired');
		const altered = new URL(fresh.url);
		altered.searchParams.set('X-Amz-Expires', '604800');
		expect((await fetch(altered)).status).toBe(403);
	});
});

describe('the public library’s media', () => {
	let versionId: string;
	let entryId: string;

	beforeAll(async () => {
		const exercise = await support.makeExercise(world, { title: `Wall slide ${world.clinicId}` });
		const submission = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const result = await publishing.decideSubmission(
			submission.id,
			{ id: world.educator.id, name: world.educator.name },
			{ decision: 'approved', comment: 'Clear.', judgement: support.ALL_JUDGEMENT }
		);
		versionId = result.versionId!;
		entryId = db()
			.select()
			.from(schema.libraryVersions)
			.all()
			.find((v) => v.id === versionId)!.libraryExerciseId;
	});

	it('redirects anyone, cacheable by a shared cache without Vary: Cookie; storage sends it as immutable', async () => {
		const response = await call(versionClip.GET, { id: versionId }, null);
		expect(response.status).toBe(307);
		const cacheControl = response.headers.get('cache-control')!;
		expect(cacheControl).toMatch(/^public, max-age=\d+$/);
		expect(Number(/max-age=(\d+)/.exec(cacheControl)![1])).toBeLessThanOrEqual(60);
		expect(response.headers.get('vary') ?? '').not.toMatch(/cookie/i);
		const stored = await follow(response, 'bytes=0-3');
		expect(stored.status).toBe(206);
		expect(stored.headers.get('cache-control')).toBe('public, max-age=31536000, immutable');
		expect(new Uint8Array(await stored.arrayBuffer())).toEqual(support.CLIP_BYTES.subarray(0, 4));
	});

	it('is unreachable once retired: the endpoint answers 410 and an address already given out 404', async () => {
		const before = await call(versionPoster.GET, { id: versionId, n: '0' }, null);
		expect(before.status).toBe(307);
		const given = before.headers.get('location')!;
		expect((await fetch(given)).status).toBe(200);
		await publishing.retireEntry(entryId);
		const after = await call(versionPoster.GET, { id: versionId, n: '0' }, null);
		expect(after.status).toBe(410);
		expect(after.headers.get('location')).toBeNull();
		expect((await fetch(given)).status).toBe(404);
	});

	it('keeps a submission’s clip for educators, privately', async () => {
		const exercise = await support.makeExercise(world, { title: 'Bridge' });
		const submission = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const educator = await call(submissionClip.GET, { id: submission.id }, educatorOf(world));
		expect(educator.status).toBe(307);
		expect(educator.headers.get('cache-control')).toBe('private, no-store');
		const clinician = await call(submissionClip.GET, { id: submission.id }, clinicianOf(world));
		expect(clinician.status).toBe(403);
		expect(clinician.headers.get('location')).toBeNull();
	});
});

describe('the bitrate ladder’s versions', () => {
	const SMALL = new TextEncoder().encode('the 360p version of this clip');
	const bytesOf = async (response: Response) =>
		new Uint8Array(await (await follow(response)).arrayBuffer());

	it('answers ?v=360 with the smaller version, and the clip itself for a size not made', async () => {
		const laddered = await support.makeSegment(world);
		const keys = recordingKeys(world.clinicId, laddered.recordingId);
		await putObject(keys.segmentVersion(laddered.id, 360), SMALL, 'video/mp4');
		db()
			.update(schema.segments)
			.set({ clipVersions: [{ short: 360, size: SMALL.length }] })
			.where(eq(schema.segments.id, laddered.id))
			.run();
		const small = await call(
			segmentClip.GET,
			{ id: laddered.id },
			clinicianOf(world),
			{},
			'?v=360'
		);
		expect(small.status).toBe(307);
		expect(await bytesOf(small)).toEqual(SMALL);
		const patient = await call(segmentClip.GET, { id: segment.id }, viewer, {}, '?v=360');
		expect(patient.status).toBe(307);
		const notMade = await call(
			segmentClip.GET,
			{ id: laddered.id },
			clinicianOf(world),
			{},
			'?v=540'
		);
		expect(await bytesOf(notMade)).toEqual(support.CLIP_BYTES);
	});

	it('gives a clip cut before the ladder to any ?v= as it is', async () => {
		const old = await call(segmentClip.GET, { id: segment.id }, clinicianOf(world), {}, '?v=360');
		expect(old.status).toBe(307);
		expect(await bytesOf(old)).toEqual(support.CLIP_BYTES);
	});

	it('refuses a version that is not on the ladder, with no address, after the access check', async () => {
		const odd = await call(segmentClip.GET, { id: segment.id }, clinicianOf(world), {}, '?v=../x');
		expect(odd.status).toBe(400);
		expect(odd.headers.get('location')).toBeNull();
		const theirs = await call(
			segmentClip.GET,
			{ id: otherSegment.id },
			clinicianOf(world),
			{},
			'?v=360'
		);
		expect(theirs.status).toBe(404);
	});

	it('serves a rendition’s smaller version, and copies a clip’s versions into the library', async () => {
		const laddered = await support.makeSegment(world);
		const keys = recordingKeys(world.clinicId, laddered.recordingId);
		await putObject(keys.rendition, support.CLIP_BYTES, 'video/mp4');
		await putObject(keys.renditionVersion(540), SMALL, 'video/mp4');
		db()
			.update(schema.recordings)
			.set({ renditionVersions: [{ short: 540, size: SMALL.length }] })
			.where(eq(schema.recordings.id, laddered.recordingId))
			.run();
		const rendition = await call(
			recordingMedia.GET,
			{ id: laddered.recordingId, asset: 'rendition.mp4' },
			clinicianOf(world),
			{},
			'?v=540'
		);
		expect(await bytesOf(rendition)).toEqual(SMALL);

		await putObject(keys.segmentVersion(laddered.id, 360), SMALL, 'video/mp4');
		db()
			.update(schema.segments)
			.set({ clipVersions: [{ short: 360, size: SMALL.length }] })
			.where(eq(schema.segments.id, laddered.id))
			.run();
		const exercise = await support.makeExercise(world, {
			title: `Ladder slide ${world.clinicId}`,
			segmentId: laddered.id
		});
		const submission = submissions.submitExercise(
			world.clinician,
			exercise.id,
			support.submissionInput(exercise)
		);
		const review = await call(
			submissionClip.GET,
			{ id: submission.id },
			educatorOf(world),
			{},
			'?v=360'
		);
		expect(await bytesOf(review)).toEqual(SMALL);
		const result = await publishing.decideSubmission(
			submission.id,
			{ id: world.educator.id, name: world.educator.name },
			{ decision: 'approved', comment: 'Clear.', judgement: support.ALL_JUDGEMENT }
		);
		const published = await call(versionClip.GET, { id: result.versionId! }, null, {}, '?v=360');
		expect(published.status).toBe(307);
		expect(new URL(published.headers.get('location')!).pathname).toContain('/library/');
		expect(await bytesOf(published)).toEqual(SMALL);
	});
});
