import { wordsForMinutes, type DueStatus, type LineState } from '$lib/floor/tile';

/** Colour classes per line state; the state's word is always shown beside it. */
export const STATE_CLASSES: Record<LineState, string> = {
	printing: 'bg-bead-600 text-white dark:bg-bead-500 dark:text-bead-950',
	attention: 'bg-flux-300 text-flux-900',
	stopped: 'bg-fault-700 text-white dark:bg-fault-500 dark:text-white',
	idle: 'bg-tin-300 text-tin-900 dark:bg-tin-700 dark:text-tin-100'
};

/** A stripe along the tile's edge in the state's colour. */
export const STATE_EDGES: Record<LineState, string> = {
	printing: 'border-l-bead-500',
	attention: 'border-l-flux-500',
	stopped: 'border-l-fault-500',
	idle: 'border-l-tin-300 dark:border-l-tin-600'
};

export const DUE_CLASSES: Record<DueStatus, string> = {
	late: 'bg-fault-100 text-fault-900 dark:bg-fault-900 dark:text-fault-100',
	due: 'bg-flux-100 text-flux-900 dark:bg-flux-900 dark:text-flux-100',
	soon: 'bg-tin-100 text-tin-800 dark:bg-tin-800 dark:text-tin-100',
	ok: 'text-tin-600 dark:text-tin-300'
};

/** Words for a capability verdict or level (both vocabularies of the assessment). */
export function capabilityWord(level: string): string {
	if (level === 'undefined' || level === 'not-assessed') return 'not assessed';
	return level.replace(/-/g, ' ');
}

/** A colour class for a capability word (the word is shown too). */
export function capabilityClass(level: string, openSignals: number): string {
	if (openSignals > 0 || level === 'not-capable' || level === 'not-stable')
		return 'text-fault-700 dark:text-fault-300';
	if (level === 'marginal') return 'text-flux-700 dark:text-flux-300';
	if (level === 'capable' || level === 'highly-capable') return 'text-bead-700 dark:text-bead-300';
	return 'text-tin-600 dark:text-tin-300';
}

/** "12 min ago", "3 h 5 min ago" from an ISO time. */
export function ago(iso: string | null, nowMs: number): string {
	if (!iso) return '–';
	const minutes = Math.max(0, (nowMs - Date.parse(iso)) / 60_000);
	return minutes < 1 ? 'just now' : `${wordsForMinutes(minutes)} ago`;
}

/** "14:05" (today) or "2 Mar 14:05". */
export function clock(iso: string | null): string {
	if (!iso) return '–';
	const d = new Date(iso);
	const today = new Date().toDateString() === d.toDateString();
	const time = d.toLocaleTimeString('en-GB', { hour: '2-digit', minute: '2-digit' });
	return today
		? time
		: `${d.toLocaleDateString('en-GB', { day: 'numeric', month: 'short' })} ${time}`;
}

/** Percent with no decimals, or a dash. */
export const pct = (v: number | null | undefined) =>
	v === null || v === undefined ? '–' : `${Math.round(v)} %`;

/** A number with `d` decimals, or a dash. */
export const num = (v: number | null | undefined, d = 1) =>
	v === null || v === undefined || !Number.isFinite(v) ? '–' : v.toFixed(d);
