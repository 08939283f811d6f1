import { SpcInputError } from './spc-input-error';

/**
 * Check that `values` is a non-empty-enough array of finite numbers.
 *
 * Used by the individuals chart and capability functions before any arithmetic, so bad
 * input gives a message naming the element (e.g. `values[7]: is "abc", expected a finite
 * number`) instead of NaN results.
 * @throws SpcInputError naming `field` or `field[i]`.
 * @example validateValues([1, 2], 'values', 2) // [1, 2]
 */
export function validateValues(values: unknown, field: string, minCount: number): number[] {
	if (!Array.isArray(values)) throw new SpcInputError(field, 'expected an array of numbers');
	values.forEach((v, i) => checkFinite(v, `${field}[${i}]`));
	if (values.length < minCount) {
		throw new SpcInputError(field, `needs at least ${minCount} values, got ${values.length}`);
	}
	return values as number[];
}

/** Rules for `validateSubgroups`. */
export interface SubgroupRules {
	chartName: string;
	minSubgroups: number;
	minSize: number;
	maxSize?: number;
	/** Hint appended when a subgroup is larger than `maxSize`. */
	tooLargeHint?: string;
	/** Hint appended when a subgroup is smaller than `minSize`. */
	tooSmallHint?: string;
}

/**
 * Check subgroups: an array of equal-size arrays of finite numbers within the size bounds.
 *
 * Used by the X̄/R, X̄/S and between/within charts. Mixed sizes are refused with the first
 * offending subgroup index (variable-size limits are not supported).
 * @throws SpcInputError naming `subgroups`, `subgroups[i]` or `subgroups[i][j]`.
 * @example
 * validateSubgroups([[1, 2], [3, 4]], 'subgroups', {
 *   chartName: 'X-bar/R', minSubgroups: 2, minSize: 2
 * })
 */
export function validateSubgroups(
	subgroups: unknown,
	field: string,
	rules: SubgroupRules
): number[][] {
	if (!Array.isArray(subgroups)) throw new SpcInputError(field, 'expected an array of subgroups');
	if (subgroups.length === 0) {
		throw new SpcInputError(field, 'is empty; give at least one subgroup');
	}
	subgroups.forEach((g, i) => {
		if (!Array.isArray(g)) {
			throw new SpcInputError(`${field}[${i}]`, 'expected an array of numbers');
		}
		g.forEach((v, j) => checkFinite(v, `${field}[${i}][${j}]`));
	});
	const groups = subgroups as number[][];
	const size = groups[0].length;
	groups.forEach((g, i) => {
		if (g.length !== size) {
			throw new SpcInputError(
				`${field}[${i}]`,
				`has ${g.length} values but subgroup 0 has ${size}; ` +
					`${rules.chartName} needs equal subgroup sizes`
			);
		}
	});
	if (size < rules.minSize) {
		throw new SpcInputError(
			`${field}[0]`,
			`subgroup size ${size} is below ${rules.minSize} for ${rules.chartName}` +
				(rules.tooSmallHint ? `; ${rules.tooSmallHint}` : '')
		);
	}
	if (rules.maxSize !== undefined && size > rules.maxSize) {
		throw new SpcInputError(
			`${field}[0]`,
			`subgroup size ${size} is above ${rules.maxSize} for ${rules.chartName}` +
				(rules.tooLargeHint ? `; ${rules.tooLargeHint}` : '')
		);
	}
	if (groups.length < rules.minSubgroups) {
		throw new SpcInputError(
			field,
			`needs at least ${rules.minSubgroups} subgroups for ${rules.chartName}, got ${groups.length}`
		);
	}
	return groups;
}

/**
 * The baseline (Phase I) indices: 0..count−1 minus `exclude`, checked for range and size.
 * @throws SpcInputError naming `exclude[i]` or `exclude` when too few points remain.
 * @example baselineIndices(5, [1, 3], 2) // [0, 2, 4]
 */
export function baselineIndices(
	count: number,
	exclude: readonly number[] | undefined,
	minRemaining: number
): number[] {
	const skip = new Set<number>();
	(exclude ?? []).forEach((idx, i) => {
		if (!Number.isInteger(idx) || idx < 0 || idx >= count) {
			throw new SpcInputError(`exclude[${i}]`, `index ${idx} is not a point index 0..${count - 1}`);
		}
		skip.add(idx);
	});
	const kept: number[] = [];
	for (let i = 0; i < count; i++) if (!skip.has(i)) kept.push(i);
	if (kept.length < minRemaining) {
		throw new SpcInputError(
			'exclude',
			`leaves ${kept.length} points for the limits; at least ${minRemaining} are needed`
		);
	}
	return kept;
}

function checkFinite(v: unknown, field: string): void {
	if (typeof v !== 'number') {
		const shown = JSON.stringify(v) ?? String(v);
		throw new SpcInputError(field, `is ${shown}, expected a finite number`);
	}
	if (!Number.isFinite(v)) throw new SpcInputError(field, `is ${v}, expected a finite number`);
}
