import { describe, expect, it } from 'vitest';
import { canonicalLanguage, isTrackKind } from './types';

describe('track kinds and languages', () => {
	it('accepts the four HTML track kinds Kinelume authors, not metadata', () => {
		// HTML track element kinds (REFERENCES.md, read): metadata is never displayed.
		expect(['captions', 'subtitles', 'chapters', 'descriptions'].every(isTrackKind)).toBe(true);
		expect(isTrackKind('metadata')).toBe(false);
		expect(isTrackKind(undefined)).toBe(false);
	});

	it('canonicalises BCP 47 tags and refuses what is not one', () => {
		expect(canonicalLanguage('en-gb')).toBe('en-GB');
		expect(canonicalLanguage(' cy ')).toBe('cy');
		expect(canonicalLanguage('english please')).toBeNull();
		expect(canonicalLanguage('')).toBeNull();
	});
});
