import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import Papa from 'papaparse';
import { openTestDatabase } from './testing';
import { auditCsv, AUDIT_CSV_HEADER, listAudit, recordAudit } from './audit';
import { createUser } from './users';
import { auditLog } from './db/schema';
import { auditQuerySchema } from '$lib/schemas/audit';
import { escapedText } from '$lib/csv/write-csv';
import type { Actor } from '$lib/access';
import type { Db } from './db';

let db: Db;
let close: () => void;
beforeEach(() => ({ db, close } = openTestDatabase()));
afterEach(() => close());

const at = (iso: string) => new Date(iso);

async function fill() {
	const quality = await createUser(
		db,
		{ email: 'q@fenmoor.example', name: 'Quinn', role: 'quality', password: 'long password 1' },
		null
	);
	const engineer = await createUser(
		db,
		{ email: 'e@fenmoor.example', name: 'Ezra', role: 'engineer', password: 'long password 2' },
		null
	);
	const asUser = (u: typeof quality): Actor => ({
		kind: 'user',
		id: u.id,
		email: u.email,
		name: u.name,
		role: u.role
	});
	db.delete(auditLog).run();
	const entries: [Actor | null, string, string, string][] = [
		[asUser(engineer), 'stencil', '2026-03-01T08:00:00Z', '=HYPERLINK("x")'],
		[asUser(engineer), 'stencil', '2026-03-02T09:00:00Z', 'B'],
		[asUser(quality), 'chart', '2026-03-02T23:59:59Z', 'C'],
		[null, 'print_run', '2026-03-03T00:00:00Z', 'D']
	];
	for (const [actor, entity, when, name] of entries) {
		recordAudit(db, actor, {
			action: 'update',
			entity,
			entityId: 7,
			before: { name: 'old' },
			after: { name }
		});
		db.update(auditLog)
			.set({ at: at(when) })
			.where(eqLast())
			.run();
	}
	return { quality, engineer };
}

// The entry just written is the one with the highest id.
const eqLast = () => eq(auditLog.id, sql`(select max(id) from audit_log)`);

describe('audit trail', () => {
	it('filters by person, kind and whole UTC days, newest first, with totals and pages', async () => {
		const { engineer } = await fill();
		const all = listAudit(db, {});
		expect(all.total).toBe(4);
		expect(all.entries.map((e) => e.after)).toEqual([
			{ name: 'D' },
			{ name: 'C' },
			{ name: 'B' },
			{ name: '=HYPERLINK("x")' }
		]);
		expect(all.entries[3]).toMatchObject({
			actorName: 'Ezra',
			actor: `user:${engineer.id}`,
			kind: 'stencil',
			recordId: '7',
			before: { name: 'old' }
		});

		expect(listAudit(db, { user: engineer.id }).total).toBe(2);
		expect(listAudit(db, { kind: 'chart' }).entries.map((e) => e.actorName)).toEqual(['Quinn']);
		// "to" a day includes its last second; "from" a day starts at its midnight.
		const day2 = listAudit(db, auditQuerySchema.parse({ from: '2026-03-02', to: '2026-03-02' }));
		expect(day2.entries.map((e) => (e.after as { name: string }).name)).toEqual(['C', 'B']);
		const paged = listAudit(db, { page: 2, pageSize: 3 });
		expect(paged).toMatchObject({ page: 2, pages: 2, total: 4 });
		expect(paged.entries).toHaveLength(1);
	});

	it('refuses malformed filters, naming them', () => {
		const bad = (q: Record<string, string>) => auditQuerySchema.safeParse(q).error?.issues[0];
		expect(bad({ user: 'abc' })).toMatchObject({ path: ['user'] });
		expect(bad({ from: '2026-02-30x' })).toMatchObject({ path: ['from'] });
		expect(bad({ from: '2026-13-45' })).toMatchObject({ path: ['from'] });
		expect(bad({ pageSize: '500' })).toMatchObject({ path: ['pageSize'] });
		expect(bad({ from: '2026-03-05', to: '2026-03-01' })).toMatchObject({ path: ['from'] });
		expect(bad({ sort: 'id' })?.code).toBe('unrecognized_keys');
	});

	it('exports the trail as CSV through the one writer', async () => {
		await fill();
		const csv = auditCsv(db, { kind: 'stencil' });
		const rows = Papa.parse<string[]>(csv.trimEnd(), { delimiter: ',', newline: '\r\n' }).data;
		expect(rows[0]).toEqual(AUDIT_CSV_HEADER);
		expect(rows).toHaveLength(3);
		expect(rows[2][8]).toBe(escapedText(JSON.stringify({ name: '=HYPERLINK("x")' })));
		expect(rows[2][3]).toBe('Ezra');
	});
});
