/**
 * The segments page's state: the boundaries being drawn (a Draft of lib/segments/plan), the
 * suggested boundaries and what was decided about each, and the confirmed segments as their cuts
 * move on. The page and its section components read and change it; the markup holds no logic.
 */
import { untrack } from 'svelte';
import { poll } from '$lib/components/poll';
import {
	addBoundary,
	draftFromSegments,
	draftSegments,
	emptyDraft,
	linkSuggestions,
	moveBoundary,
	planFromDraft,
	planProblems,
	removeBoundary,
	updatePart,
	type Draft
} from '$lib/segments/plan';
import type { SuggestionsAnswer } from '../../../routes/api/recordings/[id=id]/segment-suggestions/+server';
import type {
	ConfirmRefusal,
	RecordingSegments
} from '../../../routes/api/recordings/[id=id]/segments/+server';

export type ReadySuggestions = Extract<SuggestionsAnswer, { state: 'ready' }>;
export type SuggestionState = 'accepted' | 'dismissed' | 'pending';

/** What the planner needs of the page's data (read again whenever it changes). */
export interface PlannerSource {
	recording: { id: string; durationSeconds: number; status: string };
	confirmed: RecordingSegments;
}

export class SegmentPlanner {
	draft = $state<Draft>(emptyDraft());
	selected = $state<number | null>(null);
	editMessage = $state<string | null>(null);

	suggestions = $state<ReadySuggestions | null>(null);
	suggestionsProblem = $state<string | null>(null);
	dismissed = $state<number[]>([]);

	/** The confirmed segments as last polled (or confirmed here), newer than the page's data. */
	live = $state<RecordingSegments | null>(null);
	confirming = $state(false);
	confirmNotice = $state<string | null>(null);
	confirmProblems = $state<string[]>([]);
	confirmError = $state<string | null>(null);
	pollProblem = $state(false);

	readonly #source: () => PlannerSource;

	constructor(source: () => PlannerSource) {
		this.#source = source;
		// The page starts from what was confirmed last, so adjusting starts where one left off.
		const { confirmed, recording } = source();
		if (confirmed.segments.length > 0) {
			this.draft = draftFromSegments(
				confirmed.segments.map((s) => ({ title: s.title, start: s.start, end: s.end })),
				recording.durationSeconds
			);
		}
	}

	get duration() {
		return this.#source().recording.durationSeconds;
	}

	readonly confirmed = $derived.by(() => {
		const source = this.#source();
		return this.live && this.live.recordingId === source.recording.id
			? this.live
			: source.confirmed;
	});
	readonly parts = $derived(draftSegments(this.draft, this.duration));
	readonly plan = $derived(planFromDraft(this.draft, this.duration));
	// Problems name the parts as the list numbers them, left-out parts included.
	readonly problems = $derived.by(() => {
		const kept = this.parts.filter((p) => p.include).map((p) => p.index);
		return planProblems(this.plan, this.duration, (i) => `Part ${(kept[i] ?? i) + 1}`);
	});
	readonly pendingTimes = $derived(
		(this.suggestions?.suggestions ?? [])
			.map((s, i) => ({ time: s.time, i }))
			.filter(({ i }) => this.suggestionState(i) === 'pending')
			.map(({ time }) => time)
	);

	suggestionState(i: number): SuggestionState {
		return this.draft.sources.includes(i)
			? 'accepted'
			: this.dismissed.includes(i)
				? 'dismissed'
				: 'pending';
	}

	/**
	 * Asks for the suggested boundaries until they are worked out (202 while detection runs); a
	 * refusal stops with its message, for "Try again". Returns the function that stops asking.
	 */
	followSuggestions(): () => void {
		const id = this.#source().recording.id;
		let stopped = false;
		let timer: ReturnType<typeof setTimeout>;
		const ask = async () => {
			try {
				const response = await fetch(`/api/recordings/${id}/segment-suggestions`, {
					headers: { Accept: 'application/json' }
				});
				if (stopped) return;
				if (response.status === 202) {
					timer = setTimeout(ask, 1000);
					return;
				}
				const body = await response.json();
				if (!response.ok) throw new Error(body?.error?.message ?? String(response.status));
				this.suggestions = body as ReadySuggestions;
				this.suggestionsProblem = null;
				// Boundaries confirmed before (from suggestions, or near them) count as accepted.
				const found = this.suggestions.suggestions;
				this.draft = untrack(() => linkSuggestions(this.draft, found));
			} catch (error) {
				if (!stopped)
					this.suggestionsProblem = error instanceof Error ? error.message : String(error);
			}
		};
		void ask();
		return () => {
			stopped = true;
			clearTimeout(timer);
		};
	}

	/** Follows the confirmed segments' cuts until every one is settled. */
	followCuts(): () => void {
		const id = this.#source().recording.id;
		return poll<RecordingSegments>({
			url: `/api/recordings/${id}/segments`,
			every: 1500,
			onData: (next) => {
				this.live = next;
				return !next.settled;
			},
			onProblem: (failing) => (this.pollProblem = failing)
		});
	}

	change(next: Draft) {
		this.draft = next;
		this.editMessage = null;
		this.confirmProblems = [];
	}

	accept(i: number) {
		const s = this.suggestions?.suggestions[i];
		if (!s) return;
		const result = addBoundary(this.draft, s.time, this.duration, s.name ?? '', i);
		if (!result.ok) {
			this.editMessage = result.message;
			return;
		}
		this.change(result.draft);
		this.selected = result.index;
	}

	acceptAll() {
		let next = this.draft;
		let skipped = 0;
		(this.suggestions?.suggestions ?? []).forEach((s, i) => {
			if (this.suggestionState(i) !== 'pending') return;
			const result = addBoundary(next, s.time, this.duration, s.name ?? '', i);
			if (result.ok) next = result.draft;
			else skipped++;
		});
		this.change(next);
		if (skipped > 0) {
			this.editMessage = `${skipped} ${skipped === 1 ? 'suggestion was' : 'suggestions were'} too close to a boundary you already have and ${skipped === 1 ? 'was' : 'were'} left as they are.`;
		}
	}

	dismiss(i: number) {
		this.dismissed = [...this.dismissed, i];
	}

	reconsider(i: number) {
		this.dismissed = this.dismissed.filter((d) => d !== i);
	}

	addAt(time: number) {
		const result = addBoundary(this.draft, time, this.duration);
		if (!result.ok) {
			this.editMessage = result.message;
			return;
		}
		this.change(result.draft);
		this.selected = result.index;
	}

	move(index: number, time: number) {
		this.change(moveBoundary(this.draft, index, time, this.duration));
	}

	nudge(delta: number) {
		if (this.selected === null) return;
		this.move(this.selected, this.draft.boundaries[this.selected] + delta);
	}

	removeSelected() {
		if (this.selected === null) return;
		this.change(removeBoundary(this.draft, this.selected));
		this.selected = null;
	}

	mergeWithNext(index: number) {
		this.change(removeBoundary(this.draft, index));
		this.selected = null;
	}

	updatePart(index: number, change: Parameters<typeof updatePart>[2]) {
		this.change(updatePart(this.draft, index, change));
	}

	async confirm() {
		this.confirmNotice = null;
		this.confirmError = null;
		this.confirmProblems = this.problems;
		if (this.problems.length > 0) return;
		this.confirming = true;
		try {
			const response = await fetch(`/api/recordings/${this.#source().recording.id}/segments`, {
				method: 'POST',
				headers: { 'Content-Type': 'application/json', Accept: 'application/json' },
				body: JSON.stringify({ segments: this.plan })
			});
			const body = await response.json();
			if (response.status === 201) {
				this.live = body as RecordingSegments;
				const n = this.live.segments.length;
				this.confirmNotice = `Confirmed ${n} ${n === 1 ? 'segment' : 'segments'}. Each is being cut to its own clip; this page shows when they are ready.`;
			} else if ('problems' in body && (body as ConfirmRefusal).problems.length > 0) {
				this.confirmProblems = (body as ConfirmRefusal).problems;
			} else {
				this.confirmError = body?.error?.message ?? `The server answered ${response.status}.`;
			}
		} catch {
			this.confirmError =
				'The connection dropped before the server answered. Your segments are still here; try again.';
		} finally {
			this.confirming = false;
		}
	}
}
