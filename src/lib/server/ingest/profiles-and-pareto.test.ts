import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { ZodError } from 'zod';
import { CANONICAL_PROFILE, type MappingProfile } from '$lib/ingest';
import { openTestDatabase } from '../testing';
import { ApiError } from '../api';
import { ingestSpiFile } from './ingest-service';
import { resolveImportProfile, saveProfile } from './profiles';
import { failurePareto, getBoard, getImport, searchBoards } from './queries';

const FIXTURES = 'tests/fixtures/spi';
const x1 = JSON.parse(
	readFileSync(`${FIXTURES}/example-x1.profile.json`, 'utf8')
) as MappingProfile;

async function* once(bytes: Uint8Array) {
	yield bytes;
}

let t: ReturnType<typeof openTestDatabase>;
beforeEach(() => {
	t = openTestDatabase();
});
afterEach(() => t.close());

describe('mapping profiles', { timeout: 60_000 }, () => {
	it('saves a valid profile, finds it by id and by name, refuses a duplicate name and bad fields', () => {
		const saved = saveProfile(t.db, null, x1, null);
		expect(resolveImportProfile(t.db, String(saved.id))).toMatchObject({ profileId: saved.id });
		expect(resolveImportProfile(t.db, x1.name).profile.timeZone).toBe('Europe/Berlin');
		expect(resolveImportProfile(t.db, '')).toEqual({ profile: CANONICAL_PROFILE, profileId: null });
		expect(() => resolveImportProfile(t.db, 'nope')).toThrow(ApiError);
		expect(() => saveProfile(t.db, null, x1, null)).toThrow(/exists already/);
		expect(() =>
			saveProfile(t.db, null, { ...x1, name: 'other', timeZone: 'Mars/Base' }, null)
		).toThrow(ZodError);
	});

	it('imports an export through a profile: mm → µm, decimal comma, local time → UTC, result words', async () => {
		const saved = saveProfile(t.db, null, x1, null);
		const outcome = await ingestSpiFile(t.db, {
			source: 'api',
			fileName: 'x1.csv',
			body: once(readFileSync(`${FIXTURES}/example-x1-semicolon.csv`)),
			profile: saved.profile,
			profileId: saved.id,
			createdBy: 'user:1'
		});
		expect(outcome).toMatchObject({ status: 'imported', boards: 2, pads: 4 });
		const [board] = searchBoards(t.db, { serial: 'RB-TESTBOARD-0011' });
		// 09:15 in Berlin on 2 March 2026 (CET, UTC+1) is 08:15 UTC.
		expect(board.inspectedAt.toISOString()).toBe('2026-03-02T08:15:00.000Z');
		expect(board.line).toBe('L2');
		const r7 = getBoard(t.db, board.id)?.pads.find((p) => p.refdes === 'R7');
		// 0,0962 mm = 96.2 µm; 0,01275 mm = 12.75 µm; NG = fail
		expect(r7).toMatchObject({
			heightUm: 96.2,
			offsetXUm: 12.75,
			offsetYUm: -8,
			result: 'fail',
			panelIndex: 2
		});
	});

	it('with skip-row the good rows are stored and every skipped row is recorded', async () => {
		const outcome = await ingestSpiFile(t.db, {
			source: 'api',
			fileName: 'non-numeric.csv',
			body: once(readFileSync(`${FIXTURES}/non-numeric.csv`)),
			profile: { ...CANONICAL_PROFILE, onBadRow: 'skip-row' },
			createdBy: 'user:1'
		});
		expect(outcome).toMatchObject({ status: 'imported', pads: 1, rejectedRows: 6 });
		const record = getImport(t.db, outcome.id);
		expect(record?.rejectedRows).toBe(6);
		expect(new Set(record?.errors.map((e) => e.row))).toEqual(new Set([3, 4, 5, 6, 7, 8]));
	});
});

describe('failurePareto', { timeout: 60_000 }, () => {
	it('counts fails per pad and per refdes within the product and period, most first', async () => {
		const header =
			'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';
		const row = (
			sn: string,
			at: string,
			refdes: string,
			pad: string,
			result: string,
			product = 'P1'
		) => `${sn},${at},L1,${product},0,${refdes},${pad},50,100,100,0,0,${result}`;
		const text = [
			header,
			row('A', '2026-03-02T08:00:00Z', 'U2', '1', 'fail'),
			row('A', '2026-03-02T08:00:00Z', 'U2', '2', 'fail'),
			row('A', '2026-03-02T08:00:00Z', 'C1', '1', 'warn'),
			row('B', '2026-03-02T09:00:00Z', 'U2', '1', 'fail'),
			row('B', '2026-03-02T09:00:00Z', 'C1', '1', 'fail'),
			row('C', '2026-03-05T09:00:00Z', 'C1', '1', 'fail'), // outside the period
			row('D', '2026-03-02T09:00:00Z', 'C1', '1', 'fail', 'P2') // other product
		].join('\n');
		await ingestSpiFile(t.db, {
			source: 'api',
			fileName: 'p.csv',
			body: once(new TextEncoder().encode(text)),
			createdBy: 'user:1'
		});
		const p = failurePareto(t.db, {
			product: 'P1',
			from: new Date('2026-03-02T00:00:00Z'),
			to: new Date('2026-03-03T00:00:00Z')
		});
		expect(p.boards).toBe(2);
		expect(p.pads).toEqual([
			{ refdes: 'U2', pad: '1', fails: 2, warns: 0 },
			{ refdes: 'C1', pad: '1', fails: 1, warns: 1 },
			{ refdes: 'U2', pad: '2', fails: 1, warns: 0 }
		]);
		expect(p.refdes).toEqual([
			{ refdes: 'U2', fails: 3, warns: 0 },
			{ refdes: 'C1', fails: 1, warns: 1 }
		]);
	});
});
