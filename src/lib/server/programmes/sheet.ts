import QRCode from 'qrcode';
import { describeGuideForPatient, guidesOn } from '$lib/clinical/range-guides';
import { describeDosage, describeProgression, type Progression } from '$lib/dosage';
import { longDate } from '$lib/sessions/schedule';
import { MOVEMENT_LABELS, POSITION_LABELS, SIDE_LABELS } from '$lib/exercises/vocabulary';
import { config } from '../config';
import { renderSafetyNotes } from '../markdown';
import { patientToday, type ProgrammeView } from './index';

/** The replay page a printed code opens: one programme item (the patient's own dosage). */
export function replayUrl(itemId: string): string {
	return new URL(`/replay/${itemId}`, config().ORIGIN).toString();
}

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
			const url = replayUrl(item.id);
			const qrSvg = await QRCode.toString(url, {
				type: 'svg',
				margin: 1,
				errorCorrectionLevel: 'M',
				color: { dark: '#1c2230', light: '#ffffff' }
			});
			const e = item.exercise;
			return {
				id: item.id,
				number: i + 1,
				title: e.title,
				posterUrl: e.segment?.posterUrl ?? null,
				position: POSITION_LABELS[e.position],
				movement: MOVEMENT_LABELS[e.movementType],
				side: SIDE_LABELS[e.side],
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
						(d) => longDate(d, true),
						e.movementType
					)
				),
				cues: e.coachingCues.slice(0, SHEET_CUES).map((c) => c.text),
				moreCues: Math.max(0, e.coachingCues.length - SHEET_CUES),
				safetyHtml: renderSafetyNotes(e.safetyNotes),
				url,
				qrSvg
			};
		})
	);
	return {
		title: view.programme.title,
		status: view.programme.status,
		startDate: view.programme.startDate,
		endDate: view.programme.endDate,
		note: view.programme.note,
		patientName: view.patient.fullName,
		slingUntil:
			view.patient.slingUntil && onDate <= view.patient.slingUntil
				? longDate(view.patient.slingUntil, true)
				: null,
		items
	};
}
