import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { desc } from 'drizzle-orm';
import type { TeCurve } from '$lib/analysis';
import type { Actor } from '$lib/access';
import { ApiError } from '../api';
import { auditLog } from '../db/schema';
import { openTestDatabase } from '../testing';
import { siteThresholds } from '../stencils/thresholds';
import { createUser } from '../users';
import { seedTeTestData } from './test-data';
import { adoptLearnedLimit, learnedLimits, proposedLimit } from './learned-limit';

let t: ReturnType<typeof openTestDatabase>;
let engineer: Actor;
beforeEach(async () => {
	t = openTestDatabase();
	const user = await createUser(
		t.db,
		{
			email: 'eng@example.test',
			name: 'Test Engineer',
			role: 'engineer',
			password: 'a long test password'
		},
		null
	);
	engineer = { kind: 'user', id: user.id, email: user.email, name: user.name, role: 'engineer' };
});
afterEach(() => t.close());

// A logistic TE curve (as in te-model.test.ts): the limit where it falls to the floor is known.
const TRUTH: TeCurve = { upper: 0.95, lower: 0.4, knee: 0.62, scale: 0.05 };
const trueLimit = (floor: number) =>
	TRUTH.knee - TRUTH.scale * Math.log((TRUTH.upper - TRUTH.lower) / (floor - TRUTH.lower) - 1);
const ALL = { paste: null, powder: null, fromMs: null, toMs: null, floor: 0.7 };

describe('proposedLimit', () => {
	it('rounds up to 0.01, never down, and keeps a value already on the grid', () => {
		expect(proposedLimit(0.6312)).toBe(0.64);
		expect(proposedLimit(0.64)).toBe(0.64);
		// 0.1 × 7 is 0.7000000000000001 in binary floating point: still 0.70, not 0.71.
		expect(proposedLimit(0.1 * 7)).toBe(0.7);
	});
});

describe('learned limits on the thresholds page', { timeout: 90_000 }, () => {
	it('shows each technology: learned (with n and floor), current and common practice', async () => {
		await seedTeTestData(t.db, { curve: TRUTH, boards: 40, technology: 'electroformed' });
		const rows = await learnedLimits(t.db, 0.7);
		expect(rows.map((r) => r.technology)).toEqual(Object.keys(siteThresholds(t.db)));
		const e = rows.find((r) => r.technology === 'electroformed')!;
		expect(Math.abs(e.learnedMinAreaRatio! - trueLimit(0.7))).toBeLessThan(0.03);
		expect(e.proposedMinAreaRatio).toBe(proposedLimit(e.learnedMinAreaRatio!));
		expect(e.n).toBeGreaterThan(900);
		expect(e).toMatchObject({ floor: 0.7, currentMinAreaRatio: 0.66, commonMinAreaRatio: 0.66 });
		const none = rows.find((r) => r.technology === 'laser-stainless')!;
		expect(none).toMatchObject({ learnedMinAreaRatio: null, proposedMinAreaRatio: null, n: 0 });
		expect(none.reason).toMatch(/too few area-ratio bins/);
	});

	it('adopting saves the rounded-up limit for that technology only, audited before and after', async () => {
		await seedTeTestData(t.db, { curve: TRUTH, boards: 40, technology: 'electroformed' });
		const before = siteThresholds(t.db);
		const adopted = await adoptLearnedLimit(
			t.db,
			{ ...ALL, technology: 'electroformed' },
			engineer
		);
		expect(adopted.before).toBe(0.66);
		expect(adopted.after).toBe(proposedLimit(adopted.learnedMinAreaRatio!));
		const now = siteThresholds(t.db);
		expect(now.electroformed.minAreaRatio).toBe(adopted.after);
		expect(now.electroformed.minAspectRatio).toBe(before.electroformed.minAspectRatio);
		expect(now['laser-stainless']).toEqual(before['laser-stainless']);
		const entries = t.db.select().from(auditLog).orderBy(desc(auditLog.id)).limit(2).all();
		expect(entries.map((e) => e.action)).toEqual(['update', 'adopt-learned-limit']);
		expect(entries[1]).toMatchObject({
			actor: `user:${engineer.id}`,
			entity: 'setting',
			before: { technology: 'electroformed', minAreaRatio: 0.66 },
			after: {
				technology: 'electroformed',
				minAreaRatio: adopted.after,
				learnedMinAreaRatio: adopted.learnedMinAreaRatio,
				n: adopted.n,
				floor: 0.7
			}
		});
		expect(entries[0].before).toEqual({}); // no site overrides were stored before
		expect(
			(entries[0].after as Record<string, { minAreaRatio: number }>).electroformed.minAreaRatio
		).toBe(adopted.after);
	});

	it('refuses (422) when the data support no limit, and changes nothing', async () => {
		await seedTeTestData(t.db, { curve: TRUTH, boards: 5, technology: 'electroformed' });
		const before = siteThresholds(t.db);
		const err = await adoptLearnedLimit(
			t.db,
			{ ...ALL, technology: 'laser-stainless' },
			engineer
		).catch((e: unknown) => e);
		expect(err).toBeInstanceOf(ApiError);
		expect((err as ApiError).status).toBe(422);
		expect(siteThresholds(t.db)).toEqual(before);
		expect(
			t.db
				.select()
				.from(auditLog)
				.all()
				.filter((e) => e.entity === 'setting')
		).toEqual([]);
	});
});
