import type { ExerciseSide, MovementType } from '$lib/exercises/vocabulary';

/**
 * How to move and which side, in a patient's plain words, from the exercise's movement type, body
 * region and side and the patient's treated side. Shown on Today and on the replay, not only on
 * the printed sheet: in a passive exercise the other arm (or a strap, or a helper) does the work
 * and the treated limb stays relaxed — the detail most often lost between visits.
 */
export interface HowToMove {
	/** "Your left arm — the one being treated."; null when the side does not apply. */
	side: string | null;
	/** "Your other arm does the work; keep the arm being treated relaxed." */
	movement: string;
}

type Limb = 'arm' | 'leg' | null;

function limbOf(bodyRegion: string): Limb {
	if (/shoulder|arm|elbow|wrist|hand|upper limb/i.test(bodyRegion)) return 'arm';
	if (/hip|knee|ankle|leg|foot|thigh|calf|lower limb/i.test(bodyRegion)) return 'leg';
	return null;
}

const MOVEMENT: Record<Exclude<Limb, null> | 'other', Record<MovementType, string>> = {
	arm: {
		passive: 'Your other arm does the work; keep the arm being treated relaxed.',
		'active-assisted': 'Your other arm helps; the arm being treated does part of the work.',
		active: 'You make the movement yourself, without help.',
		resisted: 'You make the movement yourself, against the band or weight you were given.'
	},
	leg: {
		passive: 'Your hands, a strap or a helper does the work; keep the leg being treated relaxed.',
		'active-assisted':
			'Your hands, a strap or a helper helps; the leg being treated does part of the work.',
		active: 'You make the movement yourself, without help.',
		resisted: 'You make the movement yourself, against the band or weight you were given.'
	},
	other: {
		passive: 'Something else does the work (your hands, a strap or a helper); stay relaxed.',
		'active-assisted': 'Your hands, a strap or a helper helps; you do part of the work.',
		active: 'You make the movement yourself, without help.',
		resisted: 'You make the movement yourself, against the band or weight you were given.'
	}
};

export function howToMove(input: {
	movementType: MovementType;
	bodyRegion: string;
	side: ExerciseSide;
	/** The patient's treated side: left, right, both or not applicable. */
	affectedSide: string;
}): HowToMove {
	const limb = limbOf(input.bodyRegion);
	const part = limb ?? 'side';
	const treated = input.affectedSide === 'left' || input.affectedSide === 'right';
	const one = (side: 'left' | 'right') =>
		`Your ${side} ${part}${treated && input.affectedSide === side ? ' — the one being treated' : ''}.`;
	let side: string | null;
	switch (input.side) {
		case 'left':
		case 'right':
			side = one(input.side);
			break;
		case 'either':
			side = treated ? one(input.affectedSide as 'left' | 'right') : `Either ${part}.`;
			break;
		case 'both':
			side = limb ? `Both ${limb}s.` : 'Both sides.';
			break;
		default:
			side = null;
	}
	return { side, movement: MOVEMENT[limb ?? 'other'][input.movementType] };
}
