import type { Actor, Role } from '$lib/access';
import type { Db } from '../db';
import { lines, products, stencils, users } from '../db/schema';
import { createPasteLot } from './paste-lots';
import { productByCode } from './lookups';
import { setProductFit } from './product-fit';
import { saveRecipe } from './recipes';

/** A recipe inside the common-practice windows (reference/printlog/defaults.md). */
export const RECIPE_PARAMETERS = {
	squeegeeAngleDeg: { min: 45, target: 60, max: 60 },
	squeegeeSpeedMmS: { min: 20, target: 40, max: 100 },
	squeegeePressureKg: { min: 4.589, target: 7.648, max: 10.707 },
	separationSpeedMmS: { min: 0.5, target: 1, max: 3 },
	printStroke: 'alternating',
	wipeMode: 'wet-vacuum-dry'
};

/** Values on target: no deviation. */
export const ON_TARGET = {
	squeegeeAngleDeg: 60,
	squeegeeSpeedMmS: 40,
	squeegeePressureKg: 7.648,
	separationSpeedMmS: 1,
	printStroke: 'alternating',
	wipeMode: 'wet-vacuum-dry'
};

/**
 * A small factory: line L1/L2, product P1 (its stencils approved, both pastes allowed),
 * stencils, users per role, a recipe and two lots.
 */
export function seedPrintlogFixture(db: Db) {
	const actors = {} as Record<Role, Actor>;
	for (const role of ['admin', 'engineer', 'technician', 'quality', 'viewer'] as Role[]) {
		const row = db
			.insert(users)
			.values({ email: `${role}@t.example`, name: `T ${role}`, role, passwordHash: 'x' })
			.returning()
			.get();
		actors[role] = { kind: 'user', id: row.id, email: row.email, name: row.name, role };
	}
	db.insert(lines)
		.values([
			{ code: 'L1', name: 'Line 1' },
			{ code: 'L2', name: 'Line 2' }
		])
		.run();
	db.insert(products).values({ code: 'P1', name: 'Board 1' }).run();
	const stencil = (name: string, state: string, ratedLifePrints: number | null) =>
		db
			.insert(stencils)
			.values({
				name,
				revision: 'A',
				thicknessUm: 127,
				technology: 'laser-stainless',
				state,
				ratedLifePrints
			})
			.returning({ id: stencils.id })
			.get().id;
	const ids = {
		good: stencil('ST-GOOD', 'available', 10000),
		quarantined: stencil('ST-HOLD', 'quarantined', 10000),
		worn: stencil('ST-WORN', 'in-use', 100)
	};
	saveRecipe(db, { line: 'L1', product: 'P1', parameters: RECIPE_PARAMETERS }, actors.engineer);
	saveRecipe(db, { line: 'L2', product: 'P1', parameters: RECIPE_PARAMETERS }, actors.engineer);
	createPasteLot(
		db,
		// Far-future and long-expired dates on purpose, so tests never age: confirmed at receipt.
		{
			lotNumber: 'LOT-OK',
			alloy: 'SAC305',
			powderType: 4,
			expiresOn: '2099-12-31',
			confirmDates: true
		},
		actors.technician
	);
	createPasteLot(
		db,
		{
			lotNumber: 'LOT-OLD',
			alloy: 'Sn63Pb37',
			powderType: 3,
			expiresOn: '2020-01-31',
			confirmDates: true
		},
		actors.technician
	);
	// P1 takes the fixture's stencils and both lots' pastes (the product-fit tests narrow it).
	setProductFit(
		db,
		productByCode(db, 'P1')!.id,
		{
			approvals: ['ST-GOOD', 'ST-HOLD', 'ST-WORN'].map((stencil) => ({ stencil, side: 'top' })),
			alloys: ['SAC305', 'Sn63Pb37'],
			powderTypes: [3, 4]
		},
		actors.engineer
	);
	return { actors, stencilIds: ids };
}

/** A valid run payload for line L1 (override fields as needed). */
export function runPayload(overrides: Record<string, unknown> = {}) {
	return {
		line: 'L1',
		product: 'P1',
		stencil: 'ST-GOOD',
		pasteLot: 'LOT-OK',
		parameters: { ...ON_TARGET },
		...overrides
	};
}
