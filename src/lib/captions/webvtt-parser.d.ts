// webvtt-parser ships no types; only the pieces vtt.ts uses are declared.
declare module 'webvtt-parser' {
	export interface LibraryCue {
		id: string;
		startTime: number;
		endTime: number;
		direction: 'horizontal' | 'rl' | 'lr';
		snapToLines: boolean;
		linePosition: number | 'auto';
		lineAlign: 'start' | 'center' | 'end';
		textPosition: number | 'auto';
		positionAlign: 'auto' | 'line-left' | 'center' | 'line-right';
		size: number;
		alignment: 'start' | 'center' | 'end' | 'left' | 'right';
		text: string;
		[key: string]: unknown;
	}
	export type ErrorHandler = (message: string, column: number) => void;
	export class WebVTTCueTimingsAndSettingsParser {
		constructor(line: string, errorHandler: ErrorHandler);
		parse(cue: LibraryCue, previousCueStart: number): true | undefined;
	}
	export class WebVTTCueTextParser {
		constructor(
			text: string,
			errorHandler: ErrorHandler,
			mode: 'metadata' | 'chapters' | '',
			entities?: Record<string, string>
		);
		parse(cueStart: number, cueEnd: number): unknown;
	}
	const pkg: {
		WebVTTCueTimingsAndSettingsParser: typeof WebVTTCueTimingsAndSettingsParser;
		WebVTTCueTextParser: typeof WebVTTCueTextParser;
	};
	export default pkg;
}
