import { describe, expect, it } from 'vitest';
import { readReplayCode, replayCode, REPLAY_CODE_LENGTH } from './replay-code';

const ID = '3f1c9a52-8d4e-4b7a-9c21-6e0f5d8b2a47';

describe('replayCode', () => {
	it('is 8 characters of Crockford base 32, the same every time for one id', async () => {
		const code = await replayCode(ID);
		expect(code).toMatch(/^[0-9A-HJKMNP-TV-Z]{8}$/);
		expect(await replayCode(ID)).toBe(code);
	});

	it('is the first 40 bits of SHA-256 of the id', async () => {
		const { createHash } = await import('node:crypto');
		const digest = createHash('sha256').update(`kinelume/r/${ID}`).digest();
		const bits = [...digest.subarray(0, 5)].map((b) => b.toString(2).padStart(8, '0')).join('');
		const alphabet = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';
		const expected = Array.from(
			{ length: REPLAY_CODE_LENGTH },
			(_, i) => alphabet[parseInt(bits.slice(i * 5, i * 5 + 5), 2)]
		).join('');
		expect(await replayCode(ID)).toBe(expected);
	});

	it('differs between items (no two of 2,000 random ids share one)', async () => {
		const codes = new Set<string>();
		for (let i = 0; i < 2000; i++) codes.add(await replayCode(crypto.randomUUID()));
		expect(codes.size).toBe(2000);
	});
});

describe('readReplayCode', () => {
	it('takes a code as typed: any case, spaces and dashes, O for zero, I or L for one', async () => {
		const code = await replayCode(ID);
		expect(readReplayCode(code)).toBe(code);
		expect(readReplayCode(code.toLowerCase())).toBe(code);
		expect(readReplayCode(`${code.slice(0, 4)}-${code.slice(4)}`)).toBe(code);
		expect(readReplayCode('k7m2 qx9d')).toBe('K7M2QX9D');
		expect(readReplayCode('OIL23456')).toBe('01123456');
	});

	it('refuses what cannot be a code', () => {
		expect(readReplayCode('')).toBeNull();
		expect(readReplayCode('K7M2QX9')).toBeNull();
		expect(readReplayCode('K7M2QX9DD')).toBeNull();
		expect(readReplayCode('K7M2QX9U')).toBeNull();
		expect(readReplayCode('K7M2/X9D')).toBeNull();
		expect(readReplayCode(ID)).toBeNull();
	});
});
