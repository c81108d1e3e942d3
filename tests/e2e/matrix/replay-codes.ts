import { replayCode } from '../../../src/lib/programmes/replay-code';
import { seedProgramme } from '../programme-fixtures';
import { onlyPage, type MatrixPart } from './types';

/**
 * The short address a printed sheet carries, `/r/<code>`: the signed-out are sent to sign in, the
 * patient whose item it is is sent on to its replay (303 both), other roles are refused, and a
 * code of another patient's item, another clinic's, a draft's or a made-up one is a 404 — as the
 * replay itself answers.
 */
const sentOn = { ...onlyPage('patient'), patient: 303 };
const notTheirs = { ...onlyPage('patient'), patient: 404 };

export const replayCodesPart: MatrixPart = {
	async seed(f) {
		// Older than the patient part's programme, which stays the one their Today shows.
		const longAgo = Date.parse('2026-01-04T09:00:00Z');
		const own = seedProgramme(f.patientId, [{ title: 'Matrix code quad sets' }], {
			startDate: '2026-01-05',
			publishedAt: longAgo
		});
		const draft = seedProgramme(f.patientId, [{ title: 'Matrix code draft' }], {
			status: 'draft'
		});
		const other = seedProgramme(f.otherPatientId, [{ title: 'Matrix code balance' }], {
			publishedAt: longAgo
		});
		const otherClinic = seedProgramme(f.otherClinicPatientId, [{ title: 'Matrix code other' }], {
			publishedAt: longAgo
		});
		return {
			ownCode: await replayCode(own.itemIds[0]),
			draftCode: await replayCode(draft.itemIds[0]),
			otherPatientCode: await replayCode(other.itemIds[0]),
			otherClinicCode: await replayCode(otherClinic.itemIds[0])
		};
	},
	rows: [
		{
			route: '/(patient)/r/[code]',
			note: "the code of an item of the patient's published programme",
			path: (f) => `/r/${f.extra.ownCode}`,
			expect: sentOn
		},
		{
			route: '/(patient)/r/[code]',
			note: 'the same code typed in small letters with a dash',
			path: (f) => `/r/${f.extra.ownCode.slice(0, 4).toLowerCase()}-${f.extra.ownCode.slice(4)}`,
			expect: sentOn
		},
		{
			route: '/(patient)/r/[code]',
			note: "another patient's code, same clinic",
			path: (f) => `/r/${f.extra.otherPatientCode}`,
			expect: notTheirs
		},
		{
			route: '/(patient)/r/[code]',
			note: "another clinic's patient's code",
			path: (f) => `/r/${f.extra.otherClinicCode}`,
			expect: notTheirs
		},
		{
			route: '/(patient)/r/[code]',
			note: "the code of an item of the patient's draft programme",
			path: (f) => `/r/${f.extra.draftCode}`,
			expect: notTheirs
		},
		{
			route: '/(patient)/r/[code]',
			note: 'something that cannot be a code',
			path: () => '/r/not-a-code',
			expect: notTheirs
		}
	]
};
