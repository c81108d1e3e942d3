import type { MatrixRole } from '../support';

/** What every matrix row may point at: ids seeded once before the rows run. */
export interface Fixture {
	patientId: string;
	otherPatientId: string;
	otherClinicPatientId: string;
	clinicId: string;
	otherClinicId: string;
	messageId: string;
	recordingId: string;
	otherClinicRecordingId: string;
	trackId: string;
	otherClinicTrackId: string;
	/** Ids seeded by the domain parts under matrix/. */
	extra: Record<string, string>;
}

export interface Row {
	route: string;
	/** What this row shows, when a route has several rows. */
	note?: string;
	path: (f: Fixture) => string;
	expect: Record<MatrixRole, number>;
}

export const everyone = (status: number): Record<MatrixRole, number> => ({
	public: status,
	patient: status,
	clinician: status,
	educator: status,
	admin: status
});
/**
 * A media file (rendition, clip, poster) allowed to its reader: a 307 to a short-lived storage
 * address (the matrix does not follow redirects; media-redirect.test.ts follows them).
 */
export const MEDIA_OK = 307;

export const clinicianApi = (clinician: number): Record<MatrixRole, number> => ({
	public: 401,
	patient: 403,
	clinician,
	educator: 403,
	admin: 403
});
export const onlyPage = (role: Exclude<MatrixRole, 'public'>): Record<MatrixRole, number> => ({
	...everyone(403),
	public: 303,
	[role]: 200
});

/**
 * One domain's share of the matrix: its rows, and optionally the records they need, seeded once
 * (returned ids are merged into the fixture and read as `f.extra.<name>`).
 */
export interface MatrixPart {
	seed?: (fixture: Fixture) => Promise<Record<string, string>> | Record<string, string>;
	rows: Row[];
}
