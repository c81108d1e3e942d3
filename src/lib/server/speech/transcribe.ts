/**
 * Words for a draft from a speech-to-text service: any server offering the OpenAI-compatible
 * audio transcription endpoint (self-hosted speech engines offer it too, so a clinic can keep
 * its recordings in house), reached through the `openai` package.
 */
import { createReadStream } from 'node:fs';
import OpenAI, {
	APIConnectionError,
	APIConnectionTimeoutError,
	APIError,
	APIUserAbortError,
	AuthenticationError,
	NotFoundError,
	PermissionDeniedError
} from 'openai';
import { z } from 'zod';
import type { RecognisedSegment } from '$lib/captions/speech-draft';

export interface SpeechToTextSettings {
	/** Base URL up to and including /v1; empty means no service. */
	url: string;
	apiKey: string;
	model: string;
	timeoutSeconds: number;
}

export interface Transcript {
	segments: RecognisedSegment[];
	/**
	 * Set when the server says its words are not recognised speech (the local stand-in sends
	 * `stand_in`, a sentence saying so); null for a real service.
	 */
	standIn: string | null;
}

/** A service that could not be used, said in a sentence fit for the clinician. */
export class SpeechToTextError extends Error {
	constructor(message: string) {
		super(message);
		this.name = 'SpeechToTextError';
	}
}

// verbose_json as the API documents it; only what a draft uses is read.
const answerSchema = z.object({
	segments: z.array(
		z.object({
			start: z.number().finite().min(0),
			end: z.number().finite().min(0),
			text: z.string()
		})
	),
	stand_in: z.string().optional()
});

/** The service's host, for sentences: never the path or a key. */
export function serviceName(url: string): string {
	try {
		return new URL(url).host;
	} catch {
		return 'the configured address';
	}
}

/** The ISO 639-1 code the API takes from a BCP 47 tag ("en-GB" → "en"), or undefined. */
export function isoLanguage(tag: string): string | undefined {
	const primary = tag.split('-')[0]?.toLowerCase() ?? '';
	return /^[a-z]{2}$/.test(primary) ? primary : undefined;
}

function reason(error: unknown, settings: SpeechToTextSettings): string {
	const where = serviceName(settings.url);
	if (error instanceof APIUserAbortError) return 'the request was cancelled';
	if (error instanceof APIConnectionTimeoutError)
		return `${where} did not answer within ${settings.timeoutSeconds} s`;
	if (error instanceof APIConnectionError) return `${where} could not be reached`;
	if (error instanceof AuthenticationError || error instanceof PermissionDeniedError)
		return `${where} refused the API key`;
	if (error instanceof NotFoundError)
		return `${where} has no audio transcription endpoint at that address (the address should end in /v1), or no model named “${settings.model}”`;
	if (error instanceof APIError) {
		const said = error.message.replace(/^\d{3}\s*/, '').trim();
		return `${where} answered with an error${error.status ? ` (${error.status})` : ''}${said ? `: ${said}` : ''}`;
	}
	if (error instanceof z.ZodError)
		return `${where} answered without timed segments (it needs to offer response_format verbose_json)`;
	return `${where} could not be used (${error instanceof Error ? error.message : String(error)})`;
}

/**
 * Sends an audio file to the service and returns its timed segments. Any failure is thrown as a
 * SpeechToTextError whose message is a plain sentence naming the service and the reason.
 */
export async function transcribe(
	audioPath: string,
	settings: SpeechToTextSettings,
	options: { language?: string; signal?: AbortSignal } = {}
): Promise<Transcript> {
	const client = new OpenAI({
		baseURL: settings.url,
		// The SDK insists on a key; a self-hosted server without one ignores what is sent.
		apiKey: settings.apiKey || 'no-key-set',
		// Never taken from the process's OPENAI_* variables: only Kinelume's settings apply.
		organization: null,
		project: null,
		timeout: settings.timeoutSeconds * 1000,
		maxRetries: 1
	});
	try {
		const answer = await client.audio.transcriptions.create(
			{
				file: createReadStream(audioPath),
				model: settings.model,
				response_format: 'verbose_json',
				timestamp_granularities: ['segment'],
				...(options.language ? { language: options.language } : {})
			},
			{ signal: options.signal }
		);
		const parsed = answerSchema.parse(answer);
		return {
			segments: parsed.segments
				.filter((s) => s.end >= s.start)
				.map(({ start, end, text }) => ({ start, end, text: text.trim() })),
			standIn: parsed.stand_in?.trim() || null
		};
	} catch (error) {
		throw new SpeechToTextError(reason(error, settings));
	}
}
