/**
 * Stencil page timing in a real browser with 20,000 apertures: first render of the aperture map,
 * zoom and pan steps, hover, and sorting the table. Prints figures; asserts nothing about speed
 * (the expects only check the page is in the state being timed). Run by hand:
 *   flock /tmp/rollbead-e2e.lock npx playwright test -c scripts/bench-stencil-map.config.ts
 */
import { expect, test, type Page } from '@playwright/test';
import { bearer, signInAs, tokenFor } from '../tests/e2e/helpers';
import { median } from './lib/figures';

const COUNT = 20_000;

/** Resolve after the browser has painted the current state (two animation frames). */
const painted = (page: Page) =>
	page.evaluate(
		() => new Promise((done) => requestAnimationFrame(() => requestAnimationFrame(done)))
	);

function summary(label: string, ms: number[]): void {
	console.log(
		`${label.padEnd(40)} median ${median(ms).toFixed(0)} ms, best ${Math.min(...ms).toFixed(0)} ms, ` +
			`worst ${Math.max(...ms).toFixed(0)} ms (${ms.length} runs)`
	);
}

/** A 200 × 100 grid at 0.9 mm pitch of rectangles, circles, rounded rectangles and home plates. */
function syntheticApertures(count: number) {
	return Array.from({ length: count }, (_, i) => {
		const at = {
			refdes: `R${Math.floor(i / 2) + 1}`,
			pad: String((i % 2) + 1),
			xUm: (i % 200) * 900,
			yUm: Math.floor(i / 200) * 900,
			rotationDeg: (i % 2) * 90
		};
		const kind = i % 4;
		if (kind === 0)
			return {
				...at,
				shape: 'rectangle',
				lengthUm: 500 + (i % 7) * 10,
				widthUm: 250 + (i % 5) * 10
			};
		if (kind === 1) return { ...at, shape: 'circle', diameterUm: 250 + (i % 9) * 10 };
		if (kind === 2)
			return { ...at, shape: 'rounded-rectangle', lengthUm: 800, widthUm: 300, cornerRadiusUm: 60 };
		const verticesUm = [
			[-200, -150],
			[200, -150],
			[250, 0],
			[200, 150],
			[-200, 150]
		];
		return { ...at, shape: 'polygon', verticesUm };
	});
}

/**
 * PROFILE=1: one more page load under the V8 CPU profiler, then the functions with the most
 * self time, to see where the load goes.
 */
async function profileLoad(page: Page, path: string): Promise<void> {
	const cdp = await page.context().newCDPSession(page);
	await cdp.send('Profiler.enable');
	await cdp.send('Profiler.setSamplingInterval', { interval: 500 });
	await cdp.send('Profiler.start');
	await page.goto(path);
	await page.waitForFunction(
		() => document.querySelector('[data-testid="map-layer"][data-painted]') !== null,
		undefined,
		{ timeout: 120_000 }
	);
	await painted(page);
	const { profile } = await cdp.send('Profiler.stop');
	const selfMs = new Map<string, number>();
	const byId = new Map(profile.nodes.map((n) => [n.id, n]));
	const deltas = profile.timeDeltas ?? [];
	(profile.samples ?? []).forEach((id, k) => {
		const f = byId.get(id)!.callFrame;
		const key = `${f.functionName || '(anonymous)'} ${f.url.split('/').pop()}:${f.lineNumber}`;
		selfMs.set(key, (selfMs.get(key) ?? 0) + (deltas[k] ?? 0) / 1000);
	});
	console.log('\nCPU self time during one load (top 15):');
	for (const [key, ms] of [...selfMs].sort((a, b) => b[1] - a[1]).slice(0, 15))
		console.log(`${ms.toFixed(0).padStart(7)} ms  ${key}`);

	// The browser's own work (style, layout, paint, parsing) by trace event, summed by name.
	const browser = page.context().browser()!;
	await browser.startTracing(page, { categories: ['devtools.timeline', 'blink', 'v8'] });
	await page.goto(path);
	await page.waitForFunction(
		() => document.querySelector('[data-testid="map-layer"][data-painted]') !== null,
		undefined,
		{ timeout: 120_000 }
	);
	await painted(page);
	const trace = JSON.parse((await browser.stopTracing()).toString()) as {
		traceEvents: { name: string; ph: string; dur?: number }[];
	};
	const byName = new Map<string, number>();
	for (const e of trace.traceEvents)
		if (e.ph === 'X' && e.dur) byName.set(e.name, (byName.get(e.name) ?? 0) + e.dur / 1000);
	console.log('\nTrace events by total duration (nested events overlap; top 20):');
	for (const [name, ms] of [...byName].sort((a, b) => b[1] - a[1]).slice(0, 20))
		console.log(`${ms.toFixed(0).padStart(7)} ms  ${name}`);
}

test('stencil page with 20,000 apertures', async ({ page, request }) => {
	const engineer = bearer(tokenFor('engineer'));
	const created = await request.post('/api/stencils', {
		headers: engineer,
		data: {
			name: `ST-BENCH-${Date.now() % 1_000_000}`,
			revision: 'A',
			thicknessUm: 127,
			technology: 'laser-stainless'
		}
	});
	const stencil = await created.json();
	const imported = await request.post(`/api/stencils/${stencil.id}/apertures`, {
		headers: engineer,
		data: { apertures: syntheticApertures(COUNT) }
	});
	expect(imported.status()).toBe(201);
	await signInAs(page, 'engineer');

	const fetchOnly: number[] = [];
	const firstRender: number[] = [];
	const pageHtml: number[] = [];
	const dataRequest: number[] = [];
	const afterData: number[] = [];
	for (let run = 0; run < 3; run++) {
		const t = performance.now();
		await page.request.get(`/api/stencils/${stencil.id}/apertures?layout=columns`);
		fetchOnly.push(performance.now() - t);
		await page.goto(`/stencils/${stencil.id}`);
		// Counted either way the map may be built: one path per aperture, or paths with data-count.
		await page.waitForFunction(
			(n) => {
				// The canvas map: its counts, and a full rendering shown (data-painted).
				const c = document.querySelector('[data-testid="map-layer"]') as HTMLElement | null;
				if (!c || !c.dataset.painted) return false;
				return Number(c.dataset.passCount) + Number(c.dataset.failCount) === n;
			},
			COUNT,
			{ timeout: 120_000, polling: 50 }
		);
		await painted(page);
		// The page's own clock counts from the start of the navigation.
		const marks = await page.evaluate(() => {
			const nav = performance.getEntriesByType('navigation')[0] as PerformanceNavigationTiming;
			const data = performance
				.getEntriesByType('resource')
				.find((e) => /\/apertures(\?|$)/.test(e.name)) as PerformanceResourceTiming | undefined;
			return {
				painted: performance.now(),
				html: nav.responseEnd,
				dataStart: data?.startTime ?? NaN,
				dataEnd: data?.responseEnd ?? NaN
			};
		});
		firstRender.push(marks.painted);
		pageHtml.push(marks.html);
		dataRequest.push(marks.dataEnd - marks.dataStart);
		afterData.push(marks.painted - marks.dataEnd);
	}

	// The interaction loops run inside the page (no Playwright round trip per step): each step is
	// the event, then two animation frames, i.e. until the browser has painted the result.
	if (process.env.PROFILE) await profileLoad(page, `/stencils/${stencil.id}`);

	const interactions = await page.evaluate(async () => {
		const frame = () =>
			new Promise((done) => requestAnimationFrame(() => requestAnimationFrame(done)));
		const svg = document.querySelector(
			'[data-testid="aperture-map"] canvas[role="application"]'
		) as HTMLCanvasElement;
		svg.scrollIntoView({ block: 'center' });
		await frame();
		const timed = async (steps: number, act: (k: number) => void) => {
			const out: number[] = [];
			for (let k = 0; k < steps; k++) {
				const t = performance.now();
				act(k);
				await frame();
				out.push(performance.now() - t);
			}
			return out;
		};
		const key = (name: string) =>
			svg.dispatchEvent(new KeyboardEvent('keydown', { key: name, bubbles: true }));
		const zoom = await timed(10, (k) => key(k < 5 ? '+' : '-'));
		const pan = await timed(10, (k) => key(k % 2 ? 'ArrowLeft' : 'ArrowRight'));
		key('0');
		await frame();
		const box = svg.getBoundingClientRect();
		const hover = await timed(20, (k) =>
			svg.dispatchEvent(
				new PointerEvent('pointermove', {
					bubbles: true,
					pointerId: 1,
					clientX: box.left + box.width * (0.1 + k * 0.04),
					clientY: box.top + box.height * 0.5
				})
			)
		);
		const header = [...document.querySelectorAll('[data-testid="aperture-table"] th button')].find(
			(b) => b.textContent?.includes('Area ratio')
		) as HTMLButtonElement;
		const sort = await timed(6, () => header.click());
		return { zoom, pan, hover, sort };
	});

	// The same through real input (Playwright's keyboard and mouse): this adds the browser's input
	// pipeline, which with one element per aperture includes hit-testing thousands of elements.
	const svg = page.locator('[data-testid="aperture-map"] canvas[role="application"]');
	await svg.focus();
	const realZoom: number[] = [];
	for (let k = 0; k < 10; k++) {
		const t = performance.now();
		await page.keyboard.press(k < 5 ? '+' : '-');
		await painted(page);
		realZoom.push(performance.now() - t);
	}
	await page.keyboard.press('0');
	const box = (await svg.boundingBox())!;
	const realHover: number[] = [];
	for (let k = 0; k < 10; k++) {
		const t = performance.now();
		await page.mouse.move(box.x + box.width * (0.2 + k * 0.06), box.y + box.height * 0.5);
		await painted(page);
		realHover.push(performance.now() - t);
	}
	const idle: number[] = [];
	for (let k = 0; k < 10; k++) {
		const t = performance.now();
		await painted(page);
		idle.push(performance.now() - t);
	}

	console.log(
		`\nStencil page, ${COUNT.toLocaleString('en-GB')} apertures ` +
			'(page load from navigation start; interactions timed in the page, event to painted):'
	);
	summary("GET the page's apertures JSON alone", fetchOnly);
	summary('page load to map painted', firstRender);
	summary('  of which: server-rendered page received', pageHtml);
	summary('  of which: apertures request (client)', dataRequest);
	summary('  of which: after the data, to painted', afterData);
	summary('zoom step (+/−)', interactions.zoom);
	summary('pan step (arrow key)', interactions.pan);
	summary('pointer move (hover)', interactions.hover);
	summary('table sort by area ratio', interactions.sort);
	summary('real input: zoom key press to painted', realZoom);
	summary('real input: mouse move to painted', realHover);
	summary('round trip with nothing to do (floor)', idle);
});
