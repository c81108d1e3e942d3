import { ACCOUNTS } from '../support';
import { seedReadySegment } from '../segments-support';
import {
	seedCaptionRevision,
	seedCollection,
	seedExercise,
	seedPublicExercise,
	seedSubmission
} from '../library-support';
import type { MatrixRole } from '../support';
import { everyone, MEDIA_OK, onlyPage, type MatrixPart, type Row } from './types';

/**
 * The library: public pages and files for everyone (only what is published; an unpublished
 * exercise is 404, a retired one 410), the review desk for educators of any clinic, and the
 * submission form for clinicians of the exercise's clinic. A submission under review has no
 * public address at all: its files are reachable only through the educator endpoints, and the
 * segment behind it stays the clinic's (the segment endpoints refuse the public and educators).
 */

/** An endpoint only educators may use: signed-out 401, other roles 403. */
const educatorApi = (educator: number): Record<MatrixRole, number> => ({
	public: 401,
	patient: 403,
	clinician: 403,
	educator,
	admin: 403
});

const versionRows = (
	route: string,
	file: (versionId: string) => string,
	ok: number = 200
): Row[] => [
	{
		route,
		note: 'a published exercise',
		path: (f) => file(f.extra.publishedVersionId),
		expect: everyone(ok)
	},
	{
		route,
		note: 'an unpublished exercise (its copies exist, yet nothing is served)',
		path: (f) => file(f.extra.unpublishedVersionId),
		expect: everyone(404)
	},
	{
		route,
		note: 'a retired exercise',
		path: (f) => file(f.extra.retiredVersionId),
		expect: everyone(410)
	},
	{
		route,
		note: 'an id that is no version (a submission under review has none)',
		path: (f) => file(f.extra.submissionId),
		expect: everyone(404)
	}
];

const submissionRows = (
	route: string,
	file: (submissionId: string) => string,
	ok: number = 200
): Row[] => [
	{
		route,
		note: 'a submission under review',
		path: (f) => file(f.extra.submissionId),
		expect: educatorApi(ok)
	},
	{
		route,
		note: 'a caption revision under review (its files are the revised version’s copies)',
		path: (f) => file(f.extra.captionRevisionId),
		expect: educatorApi(ok)
	},
	{
		route,
		note: 'an id that is no submission',
		path: () => file(crypto.randomUUID()),
		expect: educatorApi(404)
	}
];

/** Slugs of this run's own: a rerun on the same data seeds new ones beside the old. */
const RUN = crypto.randomUUID().slice(0, 6);

export const libraryPart: MatrixPart = {
	async seed(f) {
		const segmentId = await seedReadySegment(f.recordingId, { title: 'Matrix library segment' });
		const otherClinicSegmentId = await seedReadySegment(f.otherClinicRecordingId, {
			title: 'Matrix other library segment'
		});
		const exerciseId = seedExercise(segmentId, { title: 'Matrix library exercise' });
		const otherClinicExerciseId = seedExercise(otherClinicSegmentId, {
			title: 'Matrix other clinic exercise'
		});
		const submissionId = seedSubmission(exerciseId, ACCOUNTS.clinician);
		const published = await seedPublicExercise(f.clinicId, {
			title: 'Matrix published exercise',
			slug: `matrix-published-exercise-${RUN}`
		});
		const unpublished = await seedPublicExercise(f.clinicId, {
			title: 'Matrix unpublished exercise',
			slug: `matrix-unpublished-exercise-${RUN}`,
			status: 'unpublished'
		});
		const retired = await seedPublicExercise(f.clinicId, {
			title: 'Matrix retired exercise',
			slug: `matrix-retired-exercise-${RUN}`,
			status: 'retired'
		});
		const captionRevisionId = seedCaptionRevision(published, ACCOUNTS.clinician);
		const collection = seedCollection(
			'Matrix collection',
			`matrix-collection-${RUN}`,
			'published',
			[published.entryId, unpublished.entryId]
		);
		const draft = seedCollection(
			'Matrix draft collection',
			`matrix-draft-collection-${RUN}`,
			'draft',
			[published.entryId]
		);
		return {
			librarySegmentId: segmentId,
			libraryExerciseId: exerciseId,
			otherClinicLibraryExerciseId: otherClinicExerciseId,
			submissionId,
			captionRevisionId,
			publishedVersionId: published.versionId,
			unpublishedVersionId: unpublished.versionId,
			retiredVersionId: retired.versionId,
			collectionId: collection.id,
			draftCollectionId: draft.id
		};
	},
	rows: [
		{ route: '/(public)/library', path: () => '/library', expect: everyone(200) },
		{ route: '/(public)/library/search', path: () => '/library/search', expect: everyone(200) },
		{
			route: '/(public)/library/search',
			note: 'words, every filter and a page',
			path: () =>
				'/library/search?q=heel+sli&region=Knee&position=supine&movement=active-assisted&phase=1&equipment=Towel&page=2',
			expect: everyone(200)
		},
		{
			route: '/(public)/library/search',
			note: 'unreadable parameters and FTS5 syntax are only words',
			path: () => '/library/search?q=%22heel%22+NOT+(x*&phase=zero&page=-3',
			expect: everyone(200)
		},
		{
			route: '/(public)/library/exercises/[slug=slug]',
			note: 'a published exercise',
			path: () => `/library/exercises/matrix-published-exercise-${RUN}`,
			expect: everyone(200)
		},
		{
			route: '/(public)/library/exercises/[slug=slug]',
			note: 'an unpublished exercise',
			path: () => `/library/exercises/matrix-unpublished-exercise-${RUN}`,
			expect: everyone(404)
		},
		{
			route: '/(public)/library/exercises/[slug=slug]',
			note: 'a retired exercise',
			path: () => `/library/exercises/matrix-retired-exercise-${RUN}`,
			expect: everyone(410)
		},
		{
			route: '/(public)/library/exercises/[slug=slug]',
			note: 'an address that is nothing',
			path: () => '/library/exercises/matrix-library-exercise',
			expect: everyone(404)
		},
		{
			route: '/(public)/library/collections/[slug=slug]',
			note: 'a published collection',
			path: () => `/library/collections/matrix-collection-${RUN}`,
			expect: everyone(200)
		},
		{
			route: '/(public)/library/collections/[slug=slug]',
			note: 'a draft collection',
			path: () => `/library/collections/matrix-draft-collection-${RUN}`,
			expect: everyone(404)
		},
		{ route: '/(public)/sitemap.xml', path: () => '/sitemap.xml', expect: everyone(200) },
		{ route: '/(public)/robots.txt', path: () => '/robots.txt', expect: everyone(200) },
		...versionRows(
			'/api/library/versions/[id=id]/clip.mp4',
			(id) => `/api/library/versions/${id}/clip.mp4`,
			MEDIA_OK
		),
		...versionRows(
			'/api/library/versions/[id=id]/poster-[n].jpg',
			(id) => `/api/library/versions/${id}/poster-0.jpg`,
			MEDIA_OK
		),
		{
			route: '/api/library/versions/[id=id]/poster-[n].jpg',
			note: 'a poster the version does not have',
			path: (f) => `/api/library/versions/${f.extra.publishedVersionId}/poster-7.jpg`,
			expect: everyone(404)
		},
		...versionRows(
			'/api/library/versions/[id=id]/captions.vtt',
			(id) => `/api/library/versions/${id}/captions.vtt`
		),
		...submissionRows(
			'/api/library/submissions/[id=id]/clip.mp4',
			(id) => `/api/library/submissions/${id}/clip.mp4`,
			MEDIA_OK
		),
		...submissionRows(
			'/api/library/submissions/[id=id]/poster-[n].jpg',
			(id) => `/api/library/submissions/${id}/poster-0.jpg`,
			MEDIA_OK
		),
		...submissionRows(
			'/api/library/submissions/[id=id]/captions.vtt',
			(id) => `/api/library/submissions/${id}/captions.vtt`
		),
		{
			route: '/api/segments/[id=id]/clip.mp4',
			note: 'the segment behind a submission under review stays the clinic’s',
			path: (f) => `/api/segments/${f.extra.librarySegmentId}/clip.mp4`,
			expect: { public: 401, patient: 404, clinician: MEDIA_OK, educator: 403, admin: 403 }
		},
		{
			route: '/api/segments/[id=id]/poster-[n].jpg',
			note: 'the posters behind a submission under review stay the clinic’s',
			path: (f) => `/api/segments/${f.extra.librarySegmentId}/poster-0.jpg`,
			expect: { public: 401, patient: 404, clinician: MEDIA_OK, educator: 403, admin: 403 }
		},
		{
			route: '/api/segments/[id=id]/captions.vtt',
			note: 'the captions behind a submission under review stay the clinic’s',
			path: (f) => `/api/segments/${f.extra.librarySegmentId}/captions.vtt`,
			expect: { public: 401, patient: 404, clinician: 200, educator: 403, admin: 403 }
		},
		{
			route: '/(educator)/curate',
			note: 'another view of the queue',
			path: () => '/curate?view=decided',
			expect: onlyPage('educator')
		},
		{
			route: '/(educator)/curate/submissions/[id=id]',
			note: "a submission from the educator's own clinic",
			path: (f) => `/curate/submissions/${f.extra.submissionId}`,
			expect: onlyPage('educator')
		},
		{
			route: '/(educator)/curate/submissions/[id=id]',
			note: 'a caption revision',
			path: (f) => `/curate/submissions/${f.extra.captionRevisionId}`,
			expect: onlyPage('educator')
		},
		{
			route: '/(educator)/curate/submissions/[id=id]',
			note: 'an id that is no submission',
			path: () => `/curate/submissions/${crypto.randomUUID()}`,
			expect: { ...onlyPage('educator'), educator: 404 }
		},
		{
			route: '/(educator)/curate/published',
			path: () => '/curate/published',
			expect: onlyPage('educator')
		},
		{
			route: '/(educator)/curate/collections',
			path: () => '/curate/collections',
			expect: onlyPage('educator')
		},
		{
			route: '/(educator)/curate/collections/[id=id]',
			note: 'a collection',
			path: (f) => `/curate/collections/${f.extra.collectionId}`,
			expect: onlyPage('educator')
		},
		{
			route: '/(educator)/curate/collections/[id=id]',
			note: 'an id that is no collection',
			path: () => `/curate/collections/${crypto.randomUUID()}`,
			expect: { ...onlyPage('educator'), educator: 404 }
		},
		{
			route: '/(clinician)/exercises/[id=id]/submit',
			note: "own clinic's exercise",
			path: (f) => `/exercises/${f.extra.libraryExerciseId}/submit`,
			expect: onlyPage('clinician')
		},
		{
			route: '/(clinician)/exercises/[id=id]/submit',
			note: "another clinic's exercise",
			path: (f) => `/exercises/${f.extra.otherClinicLibraryExerciseId}/submit`,
			expect: { ...onlyPage('clinician'), clinician: 404 }
		}
	]
};
