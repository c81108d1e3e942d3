import { and, eq } from 'drizzle-orm';
import QRCode from 'qrcode';
import { describeGuideForPatient, guidesOn } from '$lib/clinical/range-guides';
import { describeDosage, describeProgression, type Progression } from '$lib/dosage';
import { replayCode } from '$lib/programmes/replay-code';
import { howToMove } from '$lib/sessions/how-to-move';
import { formatDay } from '$lib/format/dates';
import { POSITION_WORDS } from '$lib/sessions/words';
import { config } from '../config';
import { db } from '../db';
import { programmeItems, programmes } from '../db/schema';
import { renderSafetyNotes } from '../markdown';
import { patientToday, type ProgrammeView } from './index';

/**
 * The short address a printed code opens, `ORIGIN/r/<code>`: short enough to type, and it
 * leads to the replay of one programme item only for the patient it belongs to.
 */
export async function replayUrl(itemId: string): Promise<string> {
	return new URL(`/r/${await replayCode(itemId)}`, config().ORIGIN).toString();
}

/**
 * The item of the patient's published programme whose printed code this is; undefined for every
 * other code (another patient's, a draft's, an ended programme's, a mistyped one). Only the
 * patient's own items are compared, so a code never reveals anyone else's.
 */
export async function ownItemByCode(patientId: string, code: string): Promise<string | undefined> {
	const items = db()
		.select({ id: programmeItems.id })
		.from(programmeItems)
		.innerJoin(programmes, eq(programmes.id, programmeItems.programmeId))
		.where(and(eq(programmes.patientId, patientId), eq(programmes.status, 'published')))
		.all();
	for (const { id } of items) if ((await replayCode(id)) === code) return id;
	return undefined;
}

/** An address as a person would type it: a browser adds `https://` by itself. */
const typed = (url: string) => url.replace(/^https:\/\//, '');

/** Most cues a printed sheet shows per exercise; the replay page has them all. */
export const SHEET_CUES = 4;

/** Everything a printed programme sheet shows, with a QR code per exercise as inline SVG. */
export async function programmeSheet(
	view: ProgrammeView,
	today: string = patientToday(view.patient)
) {
	const onDate = today > view.programme.startDate ? today : view.programme.startDate;
	const items = await Promise.all(
		view.items.map(async (item, i) => {
			const url = await replayUrl(item.id);
			const qrSvg = await QRCode.toString(url, {
				type: 'svg',
				margin: 1,
				errorCorrectionLevel: 'M',
				color: { dark: '#1c2230', light: '#ffffff' }
			});
			const e = item.exercise;
			const move = howToMove({ ...e, affectedSide: view.patient.affectedSide });
			return {
				id: item.id,
				number: i + 1,
				title: e.title,
				posterUrl: e.segment?.posterUrl ?? null,
				// The words Today and the replay use, so paper and phone say the same.
				position: POSITION_WORDS[e.position] ?? e.position,
				// "Your left leg — the one being treated.", from the patient's own treated side.
				side: move.side,
				movement: move.movement,
				equipment: e.equipment,
				dosage: describeDosage(item, item.weekdays),
				progression:
					(item.progression as Progression).kind === 'none'
						? null
						: describeProgression(item.progression as Progression),
				// The clinician's limits that still hold from the programme's start (or today).
				rangeGuides: guidesOn(item.rangeGuides, view.patient.operationDate, onDate).map((g) =>
					describeGuideForPatient(
						g,
						view.patient.operationDate,
						(d) => formatDay(d, { year: true }),
						e.movementType
					)
				),
				cues: e.coachingCues.slice(0, SHEET_CUES).map((c) => c.text),
				moreCues: Math.max(0, e.coachingCues.length - SHEET_CUES),
				safetyHtml: renderSafetyNotes(e.safetyNotes),
				url,
				typedUrl: typed(url),
				qrSvg
			};
		})
	);
	return {
		title: view.programme.title,
		status: view.programme.status,
		startDate: formatDay(view.programme.startDate, { year: true }),
		endDate: view.programme.endDate ? formatDay(view.programme.endDate, { year: true }) : null,
		note: view.programme.note,
		patientName: view.patient.fullName,
		slingUntil:
			view.patient.slingUntil && onDate <= view.patient.slingUntil
				? formatDay(view.patient.slingUntil, { year: true })
				: null,
		items
	};
}
