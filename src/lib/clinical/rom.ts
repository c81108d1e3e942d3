/**
 * Range of motion in degrees (goniometer, inclinometer or a camera estimate): against normative
 * values, against the other side, and change between two measurements, counted only when it
 * exceeds the published measurement error of the instrument used. Knee extension is the angle
 * past straight: 0 is straight, −5 is 5° short.
 */

/** What took a reading; the measurement error depends on it. */
export const ROM_INSTRUMENTS = ['goniometer', 'inclinometer', 'camera'] as const;
export type RomInstrument = (typeof ROM_INSTRUMENTS)[number];
export const INSTRUMENT_LABELS: Record<RomInstrument, string> = {
	goniometer: 'Goniometer',
	inclinometer: 'Inclinometer',
	camera: 'Estimate from a photo or video'
};

/**
 * Where the arm was for a shoulder rotation. Published normal values for rotation are measured
 * with the arm raised to 90°; after a cuff repair rotation is measured with the arm at the side
 * or in the scapular plane, and the two must not be compared (see the references).
 */
export const ARM_POSITIONS = ['side', 'scapular-plane', 'abducted-90'] as const;
export type ArmPosition = (typeof ARM_POSITIONS)[number];
export const ARM_POSITION_LABELS: Record<ArmPosition, string> = {
	side: 'Arm at the side',
	'scapular-plane': 'Arm raised a little in the scapular plane',
	'abducted-90': 'Arm raised to 90° out to the side'
};

/** The motions Kinelume records: the clinician's name, and plain words for the patient. */
export const MOTIONS = {
	'shoulder-flexion': {
		joint: 'shoulder',
		label: 'Shoulder flexion',
		plain: 'raising the arm forward and up'
	},
	'shoulder-extension': {
		joint: 'shoulder',
		label: 'Shoulder extension',
		plain: 'taking the arm back behind the body'
	},
	'shoulder-abduction': {
		joint: 'shoulder',
		label: 'Shoulder abduction',
		plain: 'raising the arm out to the side'
	},
	'shoulder-internal-rotation': {
		joint: 'shoulder',
		label: 'Shoulder internal (medial) rotation',
		plain: 'turning the forearm in toward the body'
	},
	'shoulder-external-rotation': {
		joint: 'shoulder',
		label: 'Shoulder external (lateral) rotation',
		plain: 'turning the forearm out away from the body'
	},
	'knee-flexion': { joint: 'knee', label: 'Knee flexion', plain: 'bending the knee' },
	'knee-extension': { joint: 'knee', label: 'Knee extension', plain: 'straightening the knee' },
	'hip-flexion': {
		joint: 'hip',
		label: 'Hip flexion',
		plain: 'bending the hip (knee toward the chest)'
	},
	'hip-extension': {
		joint: 'hip',
		label: 'Hip extension',
		plain: 'taking the leg back behind the body'
	},
	'hip-abduction': {
		joint: 'hip',
		label: 'Hip abduction',
		plain: 'moving the leg out to the side'
	},
	'hip-adduction': {
		joint: 'hip',
		label: 'Hip adduction',
		plain: 'moving the leg in across the middle'
	},
	'hip-internal-rotation': {
		joint: 'hip',
		label: 'Hip internal (medial) rotation',
		plain: 'turning the leg inward'
	},
	'hip-external-rotation': {
		joint: 'hip',
		label: 'Hip external (lateral) rotation',
		plain: 'turning the leg outward'
	}
} as const;

/** Motions whose normal values hold only for one arm position (shoulder rotations). */
export function needsArmPosition(motion: MotionId): boolean {
	return motion === 'shoulder-internal-rotation' || motion === 'shoulder-external-rotation';
}

export type MotionId = keyof typeof MOTIONS;

/** How sure a number is: read in the source, seen only in a summary, or recalled. */
export type Confidence = 'read' | 'secondary' | 'memory';

export const SEXES = ['female', 'male'] as const;
export type Sex = (typeof SEXES)[number];

/** One normative value: for everyone, or by sex; some only for an age band. */
export interface NormValue {
	degrees?: number;
	female?: number;
	male?: number;
	/** Inclusive ages the value describes, when the source gives a band. */
	ages?: [number, number];
	confidence: Confidence;
	/** True when the source gives a lower limit of normal ("≥") rather than a typical value. */
	minimum?: boolean;
}

export type NormSourceId = 'aaos' | 'ama' | 'cdc' | 'gill-2020';

export interface NormSource {
	id: NormSourceId;
	name: string;
	citation: string;
	values: Partial<Record<MotionId, NormValue>>;
}

/** The normative tables; AAOS is the default. */
export const NORM_SOURCES: Record<NormSourceId, NormSource> = {
	aaos: {
		id: 'aaos',
		name: 'AAOS',
		// The knee values are from memory (confidence 'memory' below; DEVELOPERS.md lists them).
		citation:
			'American Academy of Orthopaedic Surgeons, as quoted in Norkin & White, Measurement of Joint Motion, Table A.1.',
		values: {
			'shoulder-flexion': { degrees: 180, confidence: 'read' },
			'shoulder-extension': { degrees: 60, confidence: 'read' },
			'shoulder-abduction': { degrees: 180, confidence: 'read' },
			'shoulder-internal-rotation': { degrees: 70, confidence: 'read' },
			'shoulder-external-rotation': { degrees: 90, confidence: 'read' },
			'knee-flexion': { degrees: 135, confidence: 'memory' },
			'knee-extension': { degrees: 0, confidence: 'memory' },
			// Hip values from memory of the same table (confidence 'memory'; DEVELOPERS.md lists them).
			'hip-flexion': { degrees: 120, confidence: 'memory' },
			'hip-extension': { degrees: 30, confidence: 'memory' },
			'hip-abduction': { degrees: 45, confidence: 'memory' },
			'hip-adduction': { degrees: 30, confidence: 'memory' },
			'hip-internal-rotation': { degrees: 45, confidence: 'memory' },
			'hip-external-rotation': { degrees: 45, confidence: 'memory' }
		}
	},
	ama: {
		id: 'ama',
		name: 'AMA Guides',
		citation:
			'AMA Guides to the Evaluation of Permanent Impairment, as quoted in Norkin & White, Table A.1 (lower limits of normal).',
		values: {
			'shoulder-flexion': { degrees: 180, confidence: 'read', minimum: true },
			'shoulder-extension': { degrees: 50, confidence: 'read', minimum: true },
			'shoulder-abduction': { degrees: 170, confidence: 'read', minimum: true },
			'shoulder-internal-rotation': { degrees: 80, confidence: 'read', minimum: true },
			'shoulder-external-rotation': { degrees: 60, confidence: 'read', minimum: true }
		}
	},
	cdc: {
		id: 'cdc',
		name: 'CDC normal joint range of motion study',
		citation:
			'Soucie et al., Haemophilia 2011;17:500–507 (passive, goniometer); only shoulder flexion at ages 20–44 is on our list (secondary).',
		values: {
			'shoulder-flexion': { female: 172.0, male: 168.8, ages: [20, 44], confidence: 'secondary' }
		}
	},
	'gill-2020': {
		id: 'gill-2020',
		name: 'Gill et al. 2020',
		citation:
			'Gill et al., BMC Musculoskeletal Disorders 2020;21:676 (n = 2404; active motion, inclinometer).',
		values: {
			'shoulder-flexion': { female: 158.5, male: 161.5, confidence: 'read' },
			'shoulder-abduction': { female: 149.7, male: 151.5, confidence: 'read' }
		}
	}
};

/** Shown with every comparison to normal values. */
export const ROM_CAUTION =
	'Normal values describe groups of people, not this patient: the treating clinician and the surgeon’s protocol set the range to aim for.';

export interface NormOptions {
	source?: NormSourceId;
	/** Needed by sources that give values by sex. */
	sex?: Sex;
	/** Needed by sources that give values for an age band. */
	age?: number;
	/** For shoulder rotations: the normal values hold only with the arm raised to 90°. */
	armPosition?: ArmPosition | null;
}

/** The age a person born in `birthYear` may be on a date: a year's uncertainty, so null at a band's edge. */
export function ageOn(birthYear: number, date: string): { low: number; high: number } {
	const year = Number(date.slice(0, 4));
	return { low: year - birthYear - 1, high: year - birthYear };
}

/** A normal value found for a motion, with where it comes from. */
export interface NormalValue {
	degrees: number;
	source: NormSourceId;
	sourceName: string;
	citation: string;
	confidence: Confidence;
	minimum: boolean;
}

/** The normal value of a motion from a source; null when the source has none for this person. */
export function normalValue(motion: MotionId, options: NormOptions = {}): NormalValue | null {
	const source = NORM_SOURCES[options.source ?? 'aaos'];
	const value = source.values[motion];
	if (!value) return null;
	if (needsArmPosition(motion) && options.armPosition !== 'abducted-90') return null;
	if (value.ages) {
		const age = options.age;
		if (age === undefined || age < value.ages[0] || age > value.ages[1]) return null;
	}
	const degrees = value.degrees ?? (options.sex ? value[options.sex] : undefined);
	if (degrees === undefined) return null;
	return {
		degrees,
		source: source.id,
		sourceName: source.name,
		citation: source.citation,
		confidence: value.confidence,
		minimum: value.minimum ?? false
	};
}

export interface PercentOfNormal {
	/** measured ÷ normal × 100; null where normal is 0 (knee extension), since a percentage of 0 means nothing. */
	percent: number | null;
	/** Degrees short of normal (negative when beyond it). */
	shortBy: number;
	normal: NormalValue;
	caution: string;
}

/** A measurement as a percentage of the normal value; null when there is no normal value. */
export function percentOfNormal(
	measured: number,
	motion: MotionId,
	options: NormOptions = {}
): PercentOfNormal | null {
	const normal = normalValue(motion, options);
	if (!normal) return null;
	return {
		percent: normal.degrees > 0 ? (measured / normal.degrees) * 100 : null,
		shortBy: normal.degrees - measured,
		normal,
		caution: ROM_CAUTION
	};
}

/**
 * Motions where a percentage of the other side means something: those measured from zero
 * upward (flexion, abduction, rotations). Extension readings sit near zero and change sign
 * (−10° short of straight against +3° past it would be "−333%"), so they are compared by the
 * difference in degrees (common practice; see the references).
 */
export function percentOfOtherSideApplies(motion: MotionId): boolean {
	return !motion.endsWith('-extension');
}

/**
 * The affected side as a percentage of the other side; null where a ratio means nothing: an
 * extension motion, or either reading below zero, or the other side at zero.
 */
export function percentOfOtherSide(
	motion: MotionId,
	affected: number,
	other: number
): number | null {
	if (!percentOfOtherSideApplies(motion) || affected < 0 || other <= 0) return null;
	return (affected / other) * 100;
}

/** The smallest change a measurement can show beyond its error, with its source. */
export interface MeasurementError {
	degrees: number;
	basis: string;
	/** 'clinic' when the clinic gave its own figure. */
	confidence: Confidence | 'clinic';
}

const KOLBER =
	'Kolber & Hanney 2011: inter-rater minimal detectable change (90%) with an inclinometer.';
const MULLANEY =
	'Mullaney et al. 2010: inter-tester limits of agreement with a goniometer of 6–25° across shoulder motions; the figure for each motion is not on our list, so the largest is used.';
const KNEE =
	'Knee goniometry study, J Exp Orthop 2018 (doi 10.1186/s40634-018-0161-5): a long-arm goniometer needs a 10° difference to be sure of a change; after knee replacement, two testers differed by up to about 19° (Lenssen et al., BMC Musculoskelet Disord 2007;8:83).';

const KNEE_INCLINOMETER =
	'Knee goniometry study, J Exp Orthop 2018 (doi 10.1186/s40634-018-0161-5): a digital inclinometer needs a 6° difference to be sure of a change (three raters, six knees: a small study).';

const SHOULDER_MOTIONS = [
	'shoulder-flexion',
	'shoulder-extension',
	'shoulder-abduction',
	'shoulder-internal-rotation',
	'shoulder-external-rotation'
] as const satisfies readonly MotionId[];

/**
 * Measurement error by instrument and motion, each from its source. A pair not listed (a camera
 * estimate, the hip, shoulder extension with an inclinometer) has no published value on our list.
 */
export const MEASUREMENT_ERROR: Record<
	RomInstrument,
	Partial<Record<MotionId, MeasurementError>>
> = {
	inclinometer: {
		'knee-flexion': { degrees: 6, basis: KNEE_INCLINOMETER, confidence: 'read' },
		'knee-extension': { degrees: 6, basis: KNEE_INCLINOMETER, confidence: 'read' },
		'shoulder-flexion': { degrees: 8, basis: KOLBER, confidence: 'read' },
		'shoulder-abduction': { degrees: 4, basis: KOLBER, confidence: 'read' },
		'shoulder-internal-rotation': { degrees: 8, basis: KOLBER, confidence: 'read' },
		'shoulder-external-rotation': { degrees: 9, basis: KOLBER, confidence: 'read' }
	},
	goniometer: {
		...Object.fromEntries(
			SHOULDER_MOTIONS.map((m) => [m, { degrees: 25, basis: MULLANEY, confidence: 'read' }])
		),
		'knee-flexion': { degrees: 10, basis: KNEE, confidence: 'read' },
		'knee-extension': { degrees: 10, basis: KNEE, confidence: 'read' }
	},
	camera: {}
};

/** The measurement error of a motion read with an instrument; null when none is on our list. */
export function measurementError(
	motion: MotionId,
	instrument: RomInstrument
): MeasurementError | null {
	return MEASUREMENT_ERROR[instrument][motion] ?? null;
}

export interface RomChange {
	/** after − before: positive is more motion (for knee extension, nearer straight or past it). */
	change: number;
	error: MeasurementError | null;
	/** True when |change| exceeds the error; null when no error value is known. */
	beyondError: boolean | null;
	direction: 'gain' | 'loss' | 'none';
	message: string;
}

/**
 * The change between two measurements of one motion with one instrument, counted as a change only
 * when it exceeds that instrument's measurement error (or `errorDegrees`, a clinic's own figure,
 * when given). Readings by different instruments are not compared (see `rom-table`).
 */
export function romChange(
	before: number,
	after: number,
	motion: MotionId,
	instrument: RomInstrument,
	errorDegrees?: number
): RomChange {
	const change = after - before;
	const error: MeasurementError | null =
		errorDegrees !== undefined
			? {
					degrees: errorDegrees,
					basis: "The clinic's own measurement error.",
					confidence: 'clinic'
				}
			: measurementError(motion, instrument);
	const size = Math.abs(change);
	const word = change > 0 ? 'gained' : 'lost';
	if (!error) {
		return {
			change,
			error,
			beyondError: null,
			direction: change === 0 ? 'none' : change > 0 ? 'gain' : 'loss',
			message:
				change === 0
					? 'No change.'
					: `${size}° ${word}; there is no measurement error on our list for this motion, so judge it with care.`
		};
	}
	const beyondError = size > error.degrees;
	return {
		change,
		error,
		beyondError,
		direction: !beyondError ? 'none' : change > 0 ? 'gain' : 'loss',
		message: beyondError
			? `${size}° ${word}, more than the ${error.degrees}° measurement error.`
			: `No change beyond the ${error.degrees}° measurement error (${change >= 0 ? '+' : '−'}${size}°).`
	};
}
