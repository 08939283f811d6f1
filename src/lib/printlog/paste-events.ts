/**
 * Paste container handling as a small state machine. Each event moves the paste between
 * states; an event that cannot follow the current state is refused with the reason:
 *
 * | state \ event   | out-of-cold-storage | opened | on-stencil | returned      | discarded |
 * |-----------------|---------------------|--------|------------|---------------|-----------|
 * | cold-storage    | → out-sealed        | ✗      | ✗          | ✗             | → discarded |
 * | out-sealed      | ✗                   | → opened | ✗        | → cold-storage | → discarded |
 * | opened          | ✗                   | ✗      | → on-stencil | ✗ (never)   | → discarded |
 * | on-stencil      | ✗                   | ✗      | ✗          | ✗ (never)     | → discarded |
 * | discarded       | ✗                   | ✗      | ✗          | ✗             | ✗         |
 *
 * 'returned' means back into cold storage. Only a sealed container may go back: handling
 * guidance says not to re-refrigerate opened paste (REFERENCE-FACTS §e, confirmed distributor
 * guideline), because it picks up moisture and the cold container draws condensation.
 * Timestamps must not go backwards; equal timestamps keep their listed order.
 */
import type { FieldError } from './field-error';
import { describeValue, formatFieldError, PrintlogInputError } from './field-error';
import type { Instant } from './to-epoch-ms';
import { toEpochMs } from './to-epoch-ms';

/** Handling events a technician logs against a paste lot. */
export const PASTE_EVENTS = [
	'out-of-cold-storage',
	'opened',
	'on-stencil',
	'returned',
	'discarded'
] as const;
/** A paste handling event type. */
export type PasteEventType = (typeof PASTE_EVENTS)[number];

/** Where the paste is: refrigerated, out but sealed, opened, on the stencil, or discarded. */
export type PasteState = 'cold-storage' | 'out-sealed' | 'opened' | 'on-stencil' | 'discarded';

/** One logged event. */
export interface PasteEvent {
	event: PasteEventType | string;
	at: Instant;
	note?: string | null;
}

/** The paste's history replayed up to a moment: state and the times the checks need. */
export interface PasteTimeline {
	state: PasteState;
	/** Each period out of cold storage; `toMs` is null while still out. */
	outOfColdPeriods: { fromMs: number; toMs: number | null }[];
	openedAtMs: number | null;
	onStencilAtMs: number | null;
	discardedAtMs: number | null;
}

const NEXT_STATE: Readonly<Record<PasteState, Partial<Record<PasteEventType, PasteState>>>> = {
	'cold-storage': { 'out-of-cold-storage': 'out-sealed', discarded: 'discarded' },
	'out-sealed': { opened: 'opened', returned: 'cold-storage', discarded: 'discarded' },
	opened: { 'on-stencil': 'on-stencil', discarded: 'discarded' },
	'on-stencil': { discarded: 'discarded' },
	discarded: {}
};

/**
 * The state an event leads to from a state, or null when the event may not follow.
 * @example nextPasteState('out-sealed', 'opened') // 'opened'
 */
export function nextPasteState(state: PasteState, event: PasteEventType): PasteState | null {
	return NEXT_STATE[state][event] ?? null;
}

/**
 * Why an event may not follow a state, in words for the technician; null when it may.
 * @example pasteTransitionProblem('cold-storage', 'opened')
 * // "cannot open paste that is still in cold storage: log 'out-of-cold-storage' first and let it warm up, or condensation forms inside"
 */
export function pasteTransitionProblem(state: PasteState, event: PasteEventType): string | null {
	if (nextPasteState(state, event)) return null;
	if (state === 'discarded') return `the paste was discarded; no '${event}' can follow`;
	if (event === 'returned') {
		if (state === 'cold-storage') return 'the paste is already in cold storage';
		return (
			'opened paste must not go back to cold storage: it has taken up moisture and a cold ' +
			'container draws condensation (handling guidance: do not re-refrigerate opened paste); ' +
			'use it within its limits or discard it'
		);
	}
	if (event === 'out-of-cold-storage') return 'the paste is already out of cold storage';
	if (event === 'opened') {
		if (state === 'cold-storage') {
			return (
				"cannot open paste that is still in cold storage: log 'out-of-cold-storage' first " +
				'and let it warm up, or condensation forms inside'
			);
		}
		return 'the container is already open';
	}
	if (event === 'on-stencil') {
		if (state === 'cold-storage') {
			return 'the paste is in cold storage: take it out, let it warm up and open it first';
		}
		if (state === 'out-sealed') return "log 'opened' before putting the paste on the stencil";
		return 'the paste is already on the stencil';
	}
	return `'${event}' cannot follow state '${state}'`;
}

/**
 * Replay events in order up to `untilMs` (later events are ignored) and return the timeline,
 * or every problem found: unknown events, unreadable or backward timestamps, refused transitions.
 * @example replayPasteEvents([{ event: 'out-of-cold-storage', at: '2026-03-02T06:00:00Z' }]).ok // true
 */
export function replayPasteEvents(
	events: readonly PasteEvent[],
	untilMs: number = Number.POSITIVE_INFINITY
): { ok: true; timeline: PasteTimeline } | { ok: false; errors: FieldError[] } {
	const errors: FieldError[] = [];
	let state: PasteState = 'cold-storage';
	const periods: { fromMs: number; toMs: number | null }[] = [];
	let openedAtMs: number | null = null;
	let onStencilAtMs: number | null = null;
	let discardedAtMs: number | null = null;
	let previousMs = Number.NEGATIVE_INFINITY;
	for (const [index, entry] of events.entries()) {
		const where = `events[${index}]`;
		let atMs: number;
		try {
			atMs = toEpochMs(entry.at, `${where}.at`);
		} catch (error) {
			errors.push(...(error as PrintlogInputError).errors);
			continue;
		}
		if (atMs < previousMs) {
			const previous = new Date(previousMs).toISOString();
			errors.push({
				field: `${where}.at`,
				message: `must not be before the previous event (${previous})`
			});
			continue;
		}
		if (atMs > untilMs) break;
		previousMs = atMs;
		if (!(PASTE_EVENTS as readonly string[]).includes(entry.event)) {
			errors.push({
				field: `${where}.event`,
				message: `must be one of ${PASTE_EVENTS.join(', ')} (got ${describeValue(entry.event)})`
			});
			continue;
		}
		const event = entry.event as PasteEventType;
		const next = nextPasteState(state, event);
		if (!next) {
			errors.push({
				field: `${where}.event`,
				message: `'${event}' refused: ${pasteTransitionProblem(state, event)}`
			});
			continue;
		}
		if (event === 'out-of-cold-storage') periods.push({ fromMs: atMs, toMs: null });
		if (event === 'returned') {
			periods[periods.length - 1] = { ...periods[periods.length - 1], toMs: atMs };
		}
		if (event === 'opened') openedAtMs = atMs;
		if (event === 'on-stencil') onStencilAtMs = atMs;
		if (event === 'discarded') discardedAtMs = atMs;
		state = next;
	}
	if (errors.length > 0) return { ok: false, errors };
	return {
		ok: true,
		timeline: { state, outOfColdPeriods: periods, openedAtMs, onStencilAtMs, discardedAtMs }
	};
}

/**
 * Total minutes out of cold storage up to `atMs`, summed over every period (a sealed jar that
 * went back keeps the time it already spent out).
 * @example minutesOutOfCold({ outOfColdPeriods: [{ fromMs: 0, toMs: 3_600_000 }] } as PasteTimeline, 7_200_000) // 60
 */
export function minutesOutOfCold(
	timeline: Pick<PasteTimeline, 'outOfColdPeriods'>,
	atMs: number
): number {
	let totalMs = 0;
	for (const { fromMs, toMs } of timeline.outOfColdPeriods) {
		const endMs = Math.min(toMs ?? atMs, atMs);
		if (endMs > fromMs) totalMs += endMs - fromMs;
	}
	return totalMs / 60_000;
}

/**
 * Check one new event against the logged history before saving it (POST /api/paste-lots/{id}/events).
 * Returns the error that refuses it, or warnings that let it through: opening before the
 * warm-up time has passed risks condensation in the paste.
 * @example
 * checkNextPasteEvent([{ event: 'out-of-cold-storage', at: '2026-03-02T06:00:00Z' }], { event: 'opened', at: '2026-03-02T07:00:00Z' }, { warmUpMinutes: 240 })
 * // { error: null, warn: ['opened after 60 min out of cold storage; the warm-up time is 4 h: condensation may form in the paste'] }
 */
export function checkNextPasteEvent(
	history: readonly PasteEvent[],
	next: PasteEvent,
	settings: { warmUpMinutes: number }
): { error: FieldError | null; warn: string[] } {
	const replay = replayPasteEvents(history);
	if (!replay.ok) {
		const detail = replay.errors.map(formatFieldError).join('; ');
		return {
			error: { field: 'events', message: `the logged history is inconsistent: ${detail}` },
			warn: []
		};
	}
	const candidate = replayPasteEvents([...history, next]);
	if (!candidate.ok) {
		const problem = candidate.errors[candidate.errors.length - 1];
		const field = problem.field.replace(/^events\[\d+\]\./, '');
		return { error: { field, message: problem.message }, warn: [] };
	}
	const warn: string[] = [];
	const { timeline } = candidate;
	if (next.event === 'opened' && timeline.openedAtMs !== null) {
		const period = timeline.outOfColdPeriods[timeline.outOfColdPeriods.length - 1];
		const warmedMinutes = (timeline.openedAtMs - period.fromMs) / 60_000;
		if (warmedMinutes < settings.warmUpMinutes) {
			const warmUp = formatMinutes(settings.warmUpMinutes);
			warn.push(
				`opened after ${formatMinutes(warmedMinutes)} out of cold storage; the warm-up time is ${warmUp}: condensation may form in the paste`
			);
		}
	}
	return { error: null, warn };
}

/**
 * Minutes as text for messages, rounded down to the whole minute so a time just short of a
 * limit never reads as the limit: `59 min`, `3 h 59 min`, `4 h`.
 * @example formatMinutes(150) // '2 h 30 min'
 */
export function formatMinutes(minutes: number): string {
	const whole = Math.floor(minutes);
	const hours = Math.floor(whole / 60);
	const rest = whole % 60;
	if (hours === 0) return `${rest} min`;
	return rest === 0 ? `${hours} h` : `${hours} h ${rest} min`;
}
