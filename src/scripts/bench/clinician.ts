/**
 * The clinician of the authoring benchmark: every click, key press and field filled in the
 * browser goes through here and is counted, by stage. A click or a key press is one action;
 * filling or choosing a value in a field (other than a cue's words) is one action, however long
 * the value; choosing a file is the click that opens the dialog and one for the file. The words
 * typed into cues are counted apart, in characters and words. Waiting is no action: its time is
 * kept apart too, so the wall time of a stage shows how much of it was the app working.
 */
import type { Locator, Page } from '@playwright/test';

export type ActionKind = 'click' | 'key' | 'field';

export interface Action {
	kind: ActionKind;
	what: string;
}

export interface StageRecord {
	name: string;
	actions: Action[];
	typedCharacters: number;
	typedWords: number;
	startedAt: number;
	endedAt: number | null;
	/** Time spent waiting for the app (processing, drafting, cutting, saving), in ms. */
	waitedMs: number;
}

/** How long one wait for the app may take before the flow counts as broken. */
export const DEFAULT_WAIT_MS = 60_000;

export class Clinician {
	readonly stages: StageRecord[] = [];

	constructor(readonly page: Page) {}

	private get current(): StageRecord {
		const stage = this.stages.at(-1);
		if (!stage || stage.endedAt !== null) throw new Error('No stage is open.');
		return stage;
	}

	/** Ends the open stage, if any, and opens the next. */
	begin(name: string): void {
		this.finish();
		console.log(`  ${name}…`);
		this.stages.push({
			name,
			actions: [],
			typedCharacters: 0,
			typedWords: 0,
			startedAt: performance.now(),
			endedAt: null,
			waitedMs: 0
		});
	}

	finish(): void {
		const open = this.stages.at(-1);
		if (open && open.endedAt === null) open.endedAt = performance.now();
	}

	/** Acts only on a started page: before it, a button's script is not listening yet. */
	private async started(): Promise<void> {
		await this.page.locator('html[data-started]').waitFor({ state: 'attached' });
	}

	private count(kind: ActionKind, what: string): void {
		this.current.actions.push({ kind, what });
	}

	async click(target: Locator, what: string): Promise<void> {
		await this.started();
		await target.click();
		this.count('click', what);
	}

	async check(target: Locator, what: string): Promise<void> {
		await this.started();
		await target.check();
		this.count('click', what);
	}

	async press(key: string, what = key): Promise<void> {
		await this.page.keyboard.press(key);
		this.count('key', what);
	}

	async fill(target: Locator, value: string, what: string): Promise<void> {
		await this.started();
		await target.fill(value);
		this.count('field', what);
	}

	async select(target: Locator, value: string, what: string): Promise<void> {
		await this.started();
		await target.selectOption(value);
		this.count('field', what);
	}

	/** Clicks what opens the file dialog, then picks the file in it: two actions. */
	async chooseFile(opener: Locator, path: string, what: string): Promise<void> {
		await this.started();
		const [chooser] = await Promise.all([this.page.waitForEvent('filechooser'), opener.click()]);
		this.count('click', what);
		await chooser.setFiles(path);
		this.count('click', `pick ${path.split('/').pop()} in the file dialog`);
	}

	/** Types a cue's words where the focus is, key by key; counted apart from the actions. */
	async typeWords(text: string): Promise<void> {
		await this.page.keyboard.type(text);
		this.current.typedCharacters += [...text].length;
		this.current.typedWords += text.split(/\s+/).filter(Boolean).length;
	}

	/** Waits for the app; the time is kept as waiting, not as the clinician's. */
	async wait<T>(work: () => Promise<T>): Promise<T> {
		const start = performance.now();
		try {
			return await work();
		} finally {
			this.current.waitedMs += performance.now() - start;
		}
	}
}

/**
 * Polls `check` until it returns a value other than null or undefined; fails after `timeoutMs`
 * with `what` in the message.
 */
export async function until<T>(
	what: string,
	check: () => Promise<T | null | undefined>,
	timeoutMs = DEFAULT_WAIT_MS,
	everyMs = 250
): Promise<T> {
	const deadline = performance.now() + timeoutMs;
	for (;;) {
		const value = await check();
		if (value !== null && value !== undefined) return value;
		if (performance.now() > deadline) {
			throw new Error(`Gave up waiting ${Math.round(timeoutMs / 1000)} s for ${what}.`);
		}
		await new Promise((r) => setTimeout(r, everyMs));
	}
}
