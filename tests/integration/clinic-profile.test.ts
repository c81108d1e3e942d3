import './env';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

process.env.DATABASE_PATH = join(mkdtempSync(join(tmpdir(), 'kinelume-profile-')), 'profile.db');

const { makeClinic } = await import('./factories');
const { getClinicCaptionProfile, setClinicCaptionProfile } = await import(
	'../../src/lib/server/clinics'
);

describe("a clinic's caption guideline", () => {
	it('starts as the BBC profile, changes for that clinic only, and unknown clinics get the BBC', () => {
		const a = makeClinic('Clinic A');
		const b = makeClinic('Clinic B');
		expect(getClinicCaptionProfile(a.id)).toBe('bbc');
		setClinicCaptionProfile(a.id, 'dcmp');
		expect(getClinicCaptionProfile(a.id)).toBe('dcmp');
		expect(getClinicCaptionProfile(b.id)).toBe('bbc');
		expect(getClinicCaptionProfile(crypto.randomUUID())).toBe('bbc');
	});
});
