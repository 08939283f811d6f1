/**
 * Vertical positions for labels stacked at one edge of a chart (limit lines' names beside the
 * plot), moved apart as little as possible so no two are closer than `gap`: when limits coincide
 * (a constant parameter puts UCL, CL and LCL on one line) their names otherwise print over each
 * other. Keeps the input order of labels at equal positions, stays within [top, bottom] when the
 * labels fit there, and returns the positions in the input order.
 * @example spreadLabels([50, 50, 50], 11, 0, 200) // [39, 50, 61]
 */
export function spreadLabels(
	positions: readonly number[],
	gap: number,
	top: number,
	bottom: number
): number[] {
	const order = positions.map((y, i) => ({ y, i })).sort((a, b) => a.y - b.y || a.i - b.i);
	// Clusters of labels closer than `gap`, each centred on its members' mean, merged until none
	// overlaps the next (the classic pool-adjacent-violators pass, equal weights).
	type Cluster = { sum: number; n: number };
	const clusters: Cluster[] = [];
	/** The cluster's first position: centred on its mean, inside [top, bottom]. */
	const place = (c: Cluster) =>
		Math.max(top, Math.min(c.sum / c.n - ((c.n - 1) * gap) / 2, bottom - (c.n - 1) * gap));
	for (const { y } of order) {
		clusters.push({ sum: y, n: 1 });
		while (clusters.length > 1) {
			const b = clusters[clusters.length - 1];
			const a = clusters[clusters.length - 2];
			if (place(a) + a.n * gap <= place(b)) break;
			clusters.splice(-2, 2, { sum: a.sum + b.sum, n: a.n + b.n });
		}
	}
	const out = new Array<number>(positions.length);
	let k = 0;
	for (const c of clusters) {
		const lo = place(c);
		for (let j = 0; j < c.n; j++) out[order[k++].i] = lo + j * gap;
	}
	return out;
}
