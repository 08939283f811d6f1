import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { seedDemoData } from '../seed';
import { chartJson } from '$lib/spc/api-json';
import { chartDetail } from './chart-service';
import { chartSummary } from './summary';
import {
	setCapabilityThresholds,
	getCapabilityThresholds,
	ThresholdsError
} from './capability-settings';
import { assessmentLine } from './signal-mail';

let db: Db;
let close: () => void;
beforeAll(async () => {
	({ db, close } = openTestDatabase());
	await seedDemoData(db);
}, 60_000);
afterAll(() => close());

const byName = (name: string) => {
	const row = chartSummary(db).find((r) => r.name.startsWith(name));
	if (!row) throw new Error(`no chart ${name}`);
	return row;
};

describe('demo charts: one assessment everywhere (issue 13, finding 1)', () => {
	it('squeegee speed: Cpk above 3 but open signals → not stable in the list, page, API and mail', () => {
		const row = byName('Squeegee speed');
		expect(row.cpk).toBeGreaterThan(3);
		expect(row.openSignals).toBeGreaterThan(0);
		expect(row.level).toBe('not-stable');
		const detail = chartDetail(db, row.id);
		expect(detail.capability.assessment).toEqual(row.assessment);
		const api = chartJson(detail);
		expect(api.capability?.level).toBe('not-stable');
		expect(api.assessment.headline).toBe('Not stable, capability not assessed');
		expect(api.assessment.stability.openSignals).toHaveLength(row.openSignals);
		// The points are named as users know them, never "run:15".
		expect(api.assessment.detail).not.toMatch(/run:\d/);
		expect(assessmentLine(db, row.id)).toBe(
			`Capability: ${row.assessment.headline}. ${row.assessment.detail}`
		);
	});

	it('squeegee speed: the 65 mm/s run above the 60 mm/s USL is observed out of spec', () => {
		const a = byName('Squeegee speed').assessment;
		expect(a.observed?.count).toBeGreaterThanOrEqual(1);
		expect(a.observed?.total).toBeGreaterThan(0);
		expect(a.expected?.spread).toBe('overall');
		expect(a.expected?.total).toBeGreaterThan(1000);
	});

	it('paste volume in Phase I: no signals, but rules flag points → not stable', () => {
		const row = byName('Paste volume');
		expect(row.phase).toBe('I');
		expect(row.openSignals).toBe(0);
		expect(row.assessment.stability.flaggedPoints).toBeGreaterThan(0);
		expect(row.level).toBe('not-stable');
		expect(row.assessment.detail).toContain(
			`flag ${row.assessment.stability.flaggedPoints} of the ${row.points} points`
		);
	});

	it('no verdict contradicts its own chart: capable only when nothing is flagged or open', () => {
		for (const row of chartSummary(db)) {
			const d = chartDetail(db, row.id);
			const flagged = new Set((d.chart?.violations ?? []).flatMap((v) => v.points)).size;
			const stable = flagged === 0 && row.openSignals === 0;
			if (!stable) expect(row.level, row.name).toBe('not-stable');
			if (row.level === 'capable')
				expect(row.assessment.basis?.lowerBound ?? 0).toBeGreaterThanOrEqual(
					row.assessment.thresholds.capable
				);
		}
	});

	it('thresholds are a site setting: stricter ones change the verdict everywhere; bad ones are refused', () => {
		expect(getCapabilityThresholds(db)).toMatchObject({ capable: 1.33, marginal: 1 });
		expect(() =>
			setCapabilityThresholds(
				db,
				{ capable: 0.9, marginal: 1, confidenceLevel: 0.95 },
				null as never
			)
		).toThrow(ThresholdsError);
		const before = byName('Squeegee pressure');
		setCapabilityThresholds(db, { capable: 4.9, marginal: 4, confidenceLevel: 0.95 }, {
			kind: 'user',
			id: 1,
			name: 'Test',
			role: 'engineer'
		} as never);
		const after = byName('Squeegee pressure');
		expect(before.level).toBe('capable');
		expect(after.level).toBe('not-capable');
		expect(after.assessment.thresholds.capable).toBe(4.9);
		setCapabilityThresholds(db, { capable: 1.33, marginal: 1, confidenceLevel: 0.95 }, {
			kind: 'user',
			id: 1,
			name: 'Test',
			role: 'engineer'
		} as never);
	});
});
