/**
 * Stencil check speed: evaluate, summarise and sweep a 20,000-aperture stencil, as the stencil
 * page does on every load, and build what the aperture map draws (status paths, hit index) and
 * answer pointer look-ups; then the read of stencils of many-vertex polygons (issue 11). Prints
 * figures; asserts nothing.   npx tsx scripts/bench-stencil.ts
 */
import { performance } from 'node:perf_hooks';
import {
	apertureAt,
	apertureSvgPath,
	buildHitIndex,
	evaluateStencil,
	mapLayers,
	resolveThresholds,
	suggestPowderType,
	summarizeStencil,
	thicknessSweep,
	type ApertureInput
} from '../src/lib/stencil';

function syntheticStencil(count: number): ApertureInput[] {
	const apertures: ApertureInput[] = [];
	for (let i = 0; i < count; i++) {
		const kind = i % 4;
		const base = {
			refdes: `R${Math.floor(i / 2) + 1}`,
			pad: String((i % 2) + 1),
			xUm: (i % 200) * 900,
			yUm: Math.floor(i / 200) * 900,
			rotationDeg: (i % 2) * 90
		};
		if (kind === 0)
			apertures.push({
				...base,
				shape: 'rectangle',
				lengthUm: 500 + (i % 7) * 10,
				widthUm: 250 + (i % 5) * 10
			});
		else if (kind === 1)
			apertures.push({ ...base, shape: 'circle', diameterUm: 250 + (i % 9) * 10 });
		else if (kind === 2)
			apertures.push({
				...base,
				shape: 'rounded-rectangle',
				lengthUm: 800,
				widthUm: 300,
				cornerRadiusUm: 60
			});
		else
			apertures.push({
				...base,
				shape: 'polygon',
				verticesUm: [
					[-200, -150],
					[200, -150],
					[250, 0],
					[200, 150],
					[-200, 150]
				]
			});
	}
	return apertures;
}

function time<T>(label: string, runs: number, fn: () => T): T {
	let result!: T;
	const times: number[] = [];
	for (let i = 0; i < runs; i++) {
		const start = performance.now();
		result = fn();
		times.push(performance.now() - start);
	}
	times.sort((a, b) => a - b);
	console.log(
		`${label.padEnd(42)} median ${times[Math.floor(runs / 2)].toFixed(1)} ms, best ${times[0].toFixed(1)} ms (${runs} runs)`
	);
	return result;
}

const apertures = syntheticStencil(20_000);
const thresholds = resolveThresholds('laser-stainless');
const results = time('evaluate 20,000 apertures at 127 µm', 15, () =>
	evaluateStencil(apertures, { thicknessUm: 127, thresholds })
);
time('summarise the evaluated stencil', 15, () => summarizeStencil(results));
time('thickness sweep over the usual foils', 7, () => thicknessSweep(apertures, { thresholds }));
console.log(`failing apertures at 127 µm: ${results.filter((r) => r.status === 'fail').length}`);

// The aperture map: before, one <path> per aperture (20,000 path strings, then 20,000 elements);
// now two status paths and a grid index for hover and click.
const statuses = apertures.map((a, i) => ({ ...a, status: results[i].status }));
time('map, before: one path string per aperture', 7, () => statuses.map((a) => apertureSvgPath(a)));
const layers = time('map: two status paths (mapLayers)', 7, () => mapLayers(statuses));
console.log(
	`status paths: ${layers.passCount} pass + ${layers.failCount} fail outlines, ${((layers.passPath.length + layers.failPath.length) / 1e6).toFixed(2)} MB of path data`
);
const index = time('map: hit index (buildHitIndex)', 7, () => buildHitIndex(statuses));
const { xMinUm, yMinUm, xMaxUm, yMaxUm } = layers.boundsUm!;
const lookups = 100_000;
time(`map: ${lookups.toLocaleString('en-GB')} pointer look-ups (apertureAt)`, 5, () => {
	let found = 0;
	for (let k = 0; k < lookups; k++) {
		const x = xMinUm + ((k * 0.618034) % 1) * (xMaxUm - xMinUm);
		const y = yMinUm + ((k * 0.754878) % 1) * (yMaxUm - yMinUm);
		if (apertureAt(index, [x, y], 50) !== null) found++;
	}
	return found;
});

// Heavy but legal polygons: the read that took over a minute (issue 11). Each outline is a
// rippled circle of 1,000 vertices (the per-outline limit), so its convex hull keeps hundreds of
// vertices: the old per-edge scan of every hull vertex and the every-pair crossing test were
// quadratic in them. Reading a stencil evaluates, sweeps and suggests a powder from them.
function polygonStencil(count: number, vertices: number): ApertureInput[] {
	const outline: [number, number][] = Array.from({ length: vertices }, (_, k) => {
		const a = (2 * Math.PI * k) / vertices;
		const r = 400 + 15 * Math.sin(7 * a);
		return [r * Math.cos(a), r * Math.sin(a)];
	});
	return Array.from({ length: count }, (_, i) => ({
		refdes: `P${i + 1}`,
		pad: '1',
		shape: 'polygon' as const,
		verticesUm: outline,
		xUm: (i % 50) * 1000,
		yUm: Math.floor(i / 50) * 1000,
		rotationDeg: 0
	}));
}
for (const [count, vertices] of [
	[1_500, 1_000],
	[500, 1_000]
]) {
	const heavy = polygonStencil(count, vertices);
	const label = `${count.toLocaleString('en-GB')} polygons × ${vertices.toLocaleString('en-GB')} vertices`;
	time(`read ${label}: evaluate + sweep + powder`, 3, () => {
		// As `checkStoredStencil` + `stencilAdvice`: geometry computed once, reused.
		const evaluated = evaluateStencil(heavy, {
			thicknessUm: 127,
			thresholds,
			outlineCrossing: false
		});
		const sweep = thicknessSweep(heavy, { thresholds, geometries: evaluated });
		const powder = suggestPowderType(
			heavy,
			undefined,
			evaluated.map((e) => e.minDimensionUm)
		);
		return [evaluated, sweep, powder];
	});
	time(`map for ${label}: status paths + hit index`, 3, () => {
		const marked = heavy.map((a) => ({ ...a, status: 'pass' as const }));
		return [mapLayers(marked), buildHitIndex(marked)];
	});
}
