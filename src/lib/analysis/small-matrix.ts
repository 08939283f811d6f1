/**
 * Inverse of a small symmetric positive-definite matrix (rows of numbers) by Gauss–Jordan with
 * partial pivoting; null when a pivot is negligible against the largest diagonal entry
 * (numerically singular: the data do not determine every parameter).
 */
export function invertSmallMatrix(
	m: readonly (readonly number[])[],
	relTol = 1e-12
): number[][] | null {
	const n = m.length;
	const a = m.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
	const scale = Math.max(...m.map((row, i) => Math.abs(row[i])));
	if (!(scale > 0) || !Number.isFinite(scale)) return null;
	for (let c = 0; c < n; c++) {
		let p = c;
		for (let r = c + 1; r < n; r++) if (Math.abs(a[r][c]) > Math.abs(a[p][c])) p = r;
		if (!(Math.abs(a[p][c]) > relTol * scale)) return null;
		[a[c], a[p]] = [a[p], a[c]];
		const pivot = a[c][c];
		for (let j = 0; j < 2 * n; j++) a[c][j] /= pivot;
		for (let r = 0; r < n; r++) {
			if (r === c) continue;
			const f = a[r][c];
			if (f === 0) continue;
			for (let j = 0; j < 2 * n; j++) a[r][j] -= f * a[c][j];
		}
	}
	return a.map((row) => row.slice(n));
}

/** Solve m·x = b for a small matrix; null when singular. */
export function solveSmall(
	m: readonly (readonly number[])[],
	b: readonly number[]
): number[] | null {
	const inv = invertSmallMatrix(m);
	if (!inv) return null;
	return inv.map((row) => row.reduce((s, v, j) => s + v * b[j], 0));
}
