import { eq } from 'drizzle-orm';
import { profiles, type GuidelineProfile } from '$lib/captions/checks';
import { DEFAULT_TIME_ZONE } from '$lib/format/instants';
import { db } from './db';
import { clinics } from './db/schema';

export type CaptionProfileId = GuidelineProfile['id'];

/** The captioning guideline profile a clinic checks its tracks against (BBC unless it chose). */
export function getClinicCaptionProfile(clinicId: string): CaptionProfileId {
	const row = db()
		.select({ captionProfile: clinics.captionProfile })
		.from(clinics)
		.where(eq(clinics.id, clinicId))
		.get();
	const id = row?.captionProfile ?? 'bbc';
	return id in profiles ? id : 'bbc';
}

/** Sets the clinic's default caption profile; the caller has checked the admin role. */
export function setClinicCaptionProfile(clinicId: string, profile: CaptionProfileId): void {
	db().update(clinics).set({ captionProfile: profile }).where(eq(clinics.id, clinicId)).run();
}

/** The IANA time zone the clinic's pages and e-mails show times in. */
export function getClinicTimeZone(clinicId: string): string {
	const row = db()
		.select({ timeZone: clinics.timeZone })
		.from(clinics)
		.where(eq(clinics.id, clinicId))
		.get();
	return row?.timeZone ?? DEFAULT_TIME_ZONE;
}

/** Sets the clinic's time zone (an IANA name the caller has checked); the caller has checked the admin role. */
export function setClinicTimeZone(clinicId: string, timeZone: string): void {
	db().update(clinics).set({ timeZone }).where(eq(clinics.id, clinicId)).run();
}
