import { expect, test, type APIRequestContext } from '@playwright/test';
import { request as httpRequest, type IncomingMessage } from 'node:http';
import { bearer, makeToken, signInAs, tokenFor } from './helpers';

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';

/** `boards` boards on SMT-1 inspected a second apart from `startMs` (recent: the line's newest), 3 pads each. */
function spiFile(
	tag: string,
	boards: number,
	result: 'pass' | 'fail',
	startMs = Date.now() - 60_000
): string {
	const rows = [HEADER];
	for (let b = 0; b < boards; b++) {
		const at = new Date(startMs + b * 1000).toISOString();
		for (let p = 1; p <= 3; p++) {
			rows.push(
				`OV-${tag}-${b},${at},SMT-1,PB-100,0,C${p},1,101.5,99.5,121,-3.5,2,${p === 3 ? result : 'pass'}`
			);
		}
	}
	return rows.join('\n') + '\n';
}

async function importFile(request: APIRequestContext, text: string) {
	const response = await request.post('/api/spi/imports?fileName=overview.csv', {
		headers: { ...bearer(tokenFor('quality')), 'content-type': 'text/csv' },
		data: Buffer.from(text)
	});
	expect(response.status()).toBe(201);
	return response.json();
}

/** An open SSE response and a reader of its text (node:http: headers of our choosing). */
function openStream(baseURL: string, headers: Record<string, string>) {
	return new Promise<{
		res: IncomingMessage;
		readUntil: (re: RegExp, ms?: number) => Promise<string>;
		close: () => void;
	}>((resolve, reject) => {
		const req = httpRequest(`${baseURL}/api/lines/stream`, { headers }, (res) => {
			let text = '';
			const waiters: (() => void)[] = [];
			res.setEncoding('utf8');
			res.on('data', (chunk: string) => {
				text += chunk;
				for (const w of waiters.splice(0)) w();
			});
			const readUntil = (re: RegExp, ms = 10_000) =>
				new Promise<string>((done, fail) => {
					const timer = setTimeout(
						() => fail(new Error(`no ${re} within ${ms} ms; got: ${text.slice(-500)}`)),
						ms
					);
					const check = () => {
						if (re.test(text)) {
							clearTimeout(timer);
							done(text);
						} else waiters.push(check);
					};
					check();
				});
			resolve({ res, readUntil, close: () => req.destroy() });
		});
		req.on('error', reject);
		req.end();
	});
}

test.describe('line overview', () => {
	test('an SPI import changes the SMT-1 tile without a reload', async ({ page, request }) => {
		await signInAs(page, 'quality');
		await page.goto('/');
		await expect(page.getByRole('heading', { name: 'Line overview' })).toBeVisible();
		const tile = page.locator('[data-testid="line-tile"][data-line="SMT-1"]');
		await expect(tile).toBeVisible();
		await expect(page.getByTestId('connection')).toContainText('Live');
		// A marker that a reload or navigation would wipe.
		await page.evaluate(
			() => ((window as unknown as { overviewMarker: number }).overviewMarker = 1)
		);

		const tag = String(Date.now());
		await importFile(request, spiFile(`${tag}-f`, 10, 'fail', Date.now() - 60_000));
		await expect(tile.getByTestId('pass-10')).toHaveText('0 %');
		// Ten newer passing boards push the failing ones out of the last ten.
		await importFile(request, spiFile(`${tag}-p`, 10, 'pass', Date.now() - 30_000));
		await expect(tile.getByTestId('pass-10')).toHaveText('100 %');

		expect(
			await page.evaluate(() => (window as unknown as { overviewMarker?: number }).overviewMarker)
		).toBe(1);
		// The other groups stay reachable from the overview.
		await expect(page.getByRole('link', { name: 'SPI imports' }).first()).toBeVisible();
	});

	test('the page says since when the stream is lost and reconnects by itself', async ({ page }) => {
		await signInAs(page, 'viewer');
		// The server refuses the stream at first (as while it restarts): the browser gives up, the page retries.
		await page.route('**/api/lines/stream**', (route) =>
			route.fulfill({ status: 503, body: 'restarting' })
		);
		await page.goto('/');
		await expect(page.locator('[data-testid="line-tile"][data-line="SMT-1"]')).toBeVisible();
		await expect(page.getByTestId('connection')).toContainText('Connection lost since');
		await page.unroute('**/api/lines/stream**');
		await expect(page.getByTestId('connection')).toContainText('Live', { timeout: 25_000 });
	});

	test('GET /api/lines/overview answers every line as JSON; the line view shows what is due', async ({
		page,
		request
	}) => {
		const response = await request.get('/api/lines/overview', {
			headers: bearer(tokenFor('viewer'))
		});
		expect(response.status()).toBe(200);
		const body = await response.json();
		expect(typeof body.at).toBe('string');
		const codes = body.lines.map((l: { lineCode: string }) => l.lineCode);
		expect(codes).toEqual(expect.arrayContaining(['SMT-1', 'SMT-2', 'SMT-3']));
		for (const line of body.lines) {
			expect(['printing', 'attention', 'stopped', 'idle']).toContain(line.state);
			expect(line.stateWord).toBe(line.state);
		}
		const smt1 = body.lines.find((l: { lineCode: string }) => l.lineCode === 'SMT-1');

		await signInAs(page, 'technician');
		await page.goto(`/lines/${smt1.lineId}`);
		await expect(page.getByRole('heading', { name: /SMT-1/ })).toBeVisible();
		await expect(page.getByTestId('line-state')).toHaveText(smt1.stateWord);
		await expect(page.getByRole('heading', { name: 'Open signals' })).toBeVisible();
	});

	test('the stream resumes after Last-Event-ID with the events missed while away', async ({
		baseURL,
		request
	}) => {
		const auth = bearer(tokenFor('viewer'));
		const first = await openStream(baseURL!, auth);
		expect(first.res.statusCode).toBe(200);
		expect(first.res.headers['content-type']).toContain('text/event-stream');
		const snapshot = await first.readUntil(/event: snapshot\ndata: .*\n\n/);
		const ids = [...snapshot.matchAll(/^id: (\S+)$/gm)].map((m) => m[1]);
		const lastId = ids[ids.length - 1];
		first.close();

		// While away: an import on SMT-1.
		await importFile(request, spiFile(`${Date.now()}-away`, 3, 'pass'));
		// The tile is sent after a short debounce; give it time to land in the ring.
		await new Promise((r) => setTimeout(r, 1000));

		const resumed = await openStream(baseURL!, { ...auth, 'Last-Event-ID': lastId });
		const text = await resumed.readUntil(/event: line\ndata: .*"lineCode":"SMT-1".*\n\n/);
		expect(text).not.toContain('event: snapshot');
		const resumedIds = [...text.matchAll(/^id: (\S+)$/gm)].map((m) => m[1]);
		expect(resumedIds.length).toBeGreaterThan(0);
		expect(resumedIds).not.toContain(lastId);
		resumed.close();

		// An id the server cannot resume from (another process, garbage) gets a fresh snapshot.
		const fresh = await openStream(baseURL!, { ...auth, 'Last-Event-ID': 'ffffffff.1' });
		await fresh.readUntil(/event: snapshot/);
		fresh.close();

		const anonymous = await request.get('/api/lines/stream');
		expect(anonymous.status()).toBe(401);
	});

	test('the wall screen opens with a viewer display token, refuses other tokens', async ({
		browser
	}) => {
		const context = await browser.newContext();
		const page = await context.newPage();
		const token = makeToken('viewer', `e2e wall ${Date.now()}`);
		await page.goto(`/wall?token=${encodeURIComponent(token)}`);
		await expect(page.getByTestId('wall')).toBeVisible();
		await expect(page.locator('[data-testid="line-tile"][data-line="SMT-1"]')).toBeVisible();
		await expect(page.locator('[data-testid="wall"] a')).toHaveCount(0);

		const engineer = await page.goto(`/wall?token=${encodeURIComponent(tokenFor('engineer'))}`);
		expect(engineer?.status()).toBe(401);
		await context.close();
	});
});
