/**
 * What a correction changed on a print run: the recorded fields compared between the snapshot
 * before and after, so the run's history can say "stencil ST-A → ST-B" instead of only
 * "corrected". Snapshots are the plain JSON the audit log keeps (times as ISO strings).
 */
import {
	CATEGORICAL_LABELS,
	isCategoricalParameterKey,
	isWindowedParameterKey,
	NUMERIC_PARAMETERS
} from './parameters';

/** One changed field: `field` as the API names it (`parameters.x` for a setting). */
export interface RunChange {
	field: string;
	label: string;
	from: unknown;
	to: unknown;
}

/** Top-level recorded fields of a run, in the order the history lists them, with labels. */
const RUN_FIELDS: readonly (readonly [string, string])[] = [
	['stencil', 'Stencil'],
	['stencilRevision', 'Stencil revision'],
	['pasteLot', 'Paste lot'],
	['bladeCode', 'Blade'],
	['boardSerial', 'Board serial'],
	['startedAt', 'Started'],
	['endedAt', 'Ended'],
	['boardsPrinted', 'Boards printed'],
	['ambientTempC', 'Ambient temperature'],
	['relativeHumidityPct', 'Relative humidity']
];

/** Blank and absent are the same "no value". */
const norm = (value: unknown): unknown => (value === undefined || value === '' ? null : value);

function same(a: unknown, b: unknown): boolean {
	return JSON.stringify(norm(a)) === JSON.stringify(norm(b));
}

/**
 * What a user calls a print parameter ("Squeegee speed"), never its key; an unknown key is
 * split into words ("fooBarMm" → "foo bar mm").
 * @example parameterLabel('squeegeeSpeedMmS') // 'Squeegee speed'
 */
export function parameterLabel(key: string): string {
	if (isWindowedParameterKey(key)) return NUMERIC_PARAMETERS[key].label;
	if (isCategoricalParameterKey(key)) return CATEGORICAL_LABELS[key];
	return key.replace(/([a-z0-9])([A-Z])/g, '$1 $2').toLowerCase();
}

/**
 * The recorded fields that differ between two run snapshots: top-level fields first (stencil,
 * lot, blade, board serial, times, board count, ambient), then every parameter in the union of
 * both, sorted by key. Blank and missing count as the same.
 * @example runChanges({ stencil: 'ST-A', parameters: {} }, { stencil: 'ST-B', parameters: {} })
 * // [{ field: 'stencil', label: 'Stencil', from: 'ST-A', to: 'ST-B' }]
 */
export function runChanges(
	before: Readonly<Record<string, unknown>>,
	after: Readonly<Record<string, unknown>>
): RunChange[] {
	const changes: RunChange[] = [];
	for (const [field, label] of RUN_FIELDS) {
		if (!same(before[field], after[field])) {
			changes.push({ field, label, from: norm(before[field]), to: norm(after[field]) });
		}
	}
	const asRecord = (value: unknown) =>
		(value && typeof value === 'object' ? value : {}) as Record<string, unknown>;
	const fromParams = asRecord(before.parameters);
	const toParams = asRecord(after.parameters);
	const keys = [...new Set([...Object.keys(fromParams), ...Object.keys(toParams)])].sort();
	for (const key of keys) {
		if (!same(fromParams[key], toParams[key])) {
			changes.push({
				field: `parameters.${key}`,
				label: parameterLabel(key),
				from: norm(fromParams[key]),
				to: norm(toParams[key])
			});
		}
	}
	return changes;
}

/**
 * One change as a short sentence for the history: `Stencil: ST-A → ST-B`, `—` for no value.
 * @example describeRunChange({ field: 'bladeCode', label: 'Blade', from: null, to: 'BL-3' }) // 'Blade: — → BL-3'
 */
export function describeRunChange(change: RunChange): string {
	const show = (value: unknown) => (value === null ? '—' : String(value));
	return `${change.label}: ${show(change.from)} → ${show(change.to)}`;
}
