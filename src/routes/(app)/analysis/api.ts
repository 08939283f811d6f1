/**
 * The analysis page's view of the API answers it draws (the fields it reads), and the fetch
 * helper its sections share.
 */
import type { CsvCell } from '$lib/csv/write-csv';

export type Failure = { error: string; fields?: { field: string; message: string }[] };

/** One column of a DataTable: `text` is shown (rounded), `value` goes to the CSV (unrounded). */
export interface Column<R> {
	label: string;
	/** Shown text; leave out for a CSV-only column. */
	text?: (r: R) => string;
	/** CSV header; leave out for a column only shown. */
	csv?: string;
	/** CSV value (default: the shown text). */
	value?: (r: R) => CsvCell;
	numeric?: boolean;
	href?: (r: R) => string;
}

export type TeAnswer = {
	n: number;
	trimmed: number;
	bins: {
		areaRatio: number;
		teMean: number;
		teP10: number;
		teP90: number;
		n: number;
		trimmed: number;
	}[];
	fit: {
		model: string;
		coefficients: { upper: number; lower: number; knee: number; scale: number };
		residualSd: number;
		band: { areaRatio: number; fit: number; lower: number; upper: number }[];
	} | null;
	floor: number;
	learnedMinAreaRatio: number | null;
	learnedMinAreaRatioInterval: [number | null, number] | null;
	reason: string | null;
	boardsMatched: number;
	boardsUsed: number;
	padsWithoutVolume: number;
	note: string | null;
};

export type ParamAnswer = {
	n: number;
	points: {
		runId: number;
		startedAt: string;
		line: string;
		product: string;
		boards: number;
		x: number;
		y: number;
	}[];
	fit: {
		intercept: number;
		slope: number;
		slopeSe: number;
		rSquared: number;
		band: { x: number; fit: number; lower: number; upper: number }[];
	} | null;
	correlation: {
		r: number;
		lower: number | null;
		upper: number | null;
		level: number;
		n: number;
	} | null;
	reason: string | null;
	caution: string;
	note: string | null;
};

export type WearAnswer = {
	points: {
		runId: number;
		startedAt: string;
		printsBefore: number;
		teMean: number | null;
		volumeMean: number | null;
		boards: number;
	}[];
	fit: { slope: number; slopeSe: number; perThousandPrints: number; intercept: number } | null;
	teDrop: number | null;
	drop: number;
	flagged: boolean;
	reason: string | null;
	sinceWipe: {
		printsSinceWipe: number;
		boards: number;
		teMean: number | null;
		volumeMean: number | null;
	}[];
};

export type PredictedAnswer = {
	technology: string;
	model: unknown;
	reason: string | null;
	learnedMinAreaRatio: number | null;
	apertures: number;
	belowFloor: number;
	notCovered: number;
	listed: {
		id: number;
		refdes: string;
		pad: string;
		areaRatio: number;
		predictedTe: number;
		lower: number;
		upper: number;
		covered: boolean;
	}[];
};

export type YieldAnswer = {
	by: string;
	groups: {
		key: string;
		boards: number;
		passBoards: number;
		firstPassYield: number;
		failingPads: number;
	}[];
	total: { boards: number; passBoards: number; firstPassYield: number | null };
	reinspections: number;
};

export type MapAnswer = {
	boards: number;
	pads: {
		refdes: string;
		pad: string;
		panelIndex: number;
		xUm: number | null;
		yUm: number | null;
		inspected: number;
		fails: number;
		warns: number;
		failRate: number;
	}[];
	byClass: {
		padClass: string;
		fails: number;
		warns: number;
		inspected: number;
		failRate: number;
	}[];
	byKind: {
		kind: string;
		label: string;
		fails: number;
		share: number;
		cumulativeShare: number;
	}[];
	failsWithinWindows: number;
	note: string | null;
};

/** A query string of the non-empty entries. */
export const query = (entries: Record<string, string>) =>
	new URLSearchParams(Object.entries(entries).filter(([, v]) => v.trim() !== '')).toString();

/**
 * Fetch JSON; the returned function aborts it (an $effect's cleanup, so a newer choice of
 * filters replaces an older request).
 */
export function loadJson<T>(
	url: string,
	set: (v: T | null, e: Failure | null) => void,
	busy: (b: boolean) => void = () => {}
): () => void {
	const ctrl = new AbortController();
	busy(true);
	fetch(url, { signal: ctrl.signal, headers: { accept: 'application/json' } })
		.then(async (res) => {
			const body = await res.json().catch(() => ({ error: `HTTP ${res.status}` }));
			if (res.ok) set(body as T, null);
			else set(null, body as Failure);
		})
		.catch((err) => {
			if ((err as Error).name !== 'AbortError') set(null, { error: String(err) });
		})
		.finally(() => {
			if (!ctrl.signal.aborted) busy(false);
		});
	return () => ctrl.abort();
}
