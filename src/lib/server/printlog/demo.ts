import { desc, eq } from 'drizzle-orm';
import { checkRunAgainstRecipe, type RecipeParameters } from '$lib/printlog';
import type { Db } from '../db';
import { pasteEvents, pasteLots, printRuns, stencils } from '../db/schema';
import { lineByCode, productByCode } from './lookups';
import { currentRecipeFor, saveRecipe } from './recipes';

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

/** Demo recipes (Fenmoor Works, invented): windows from the common-practice defaults. */
const DEMO_RECIPES: { line: string; product: string; parameters: RecipeParameters }[] = [
	{
		line: 'SMT-1',
		product: 'PB-100',
		parameters: {
			squeegeeAngleDeg: { min: 55, target: 60, max: 60 },
			squeegeeSpeedMmS: { min: 30, target: 40, max: 60 },
			squeegeePressureKg: { min: 5.5, target: 7, max: 8.5 },
			separationSpeedMmS: { min: 0.5, target: 1, max: 2 },
			separationDistanceMm: { min: 1, target: 2, max: 3 },
			printGapMm: { min: 0, target: 0, max: 0 },
			bladeLengthMm: { min: 300, target: 300, max: 300 },
			wipeIntervalPrints: { min: 1, target: 3, max: 5 },
			printStroke: 'alternating',
			bladeType: 'metal',
			wipeMode: 'wet-vacuum-dry',
			boardSupport: 'pins'
		}
	},
	{
		line: 'SMT-2',
		product: 'SH-220',
		parameters: {
			squeegeeAngleDeg: { min: 45, target: 60, max: 60 },
			squeegeeSpeedMmS: { min: 25, target: 50, max: 80 },
			squeegeePressureKg: { min: 4.5, target: 6, max: 8 },
			separationSpeedMmS: { min: 0.5, target: 1.5, max: 3 },
			wipeIntervalPrints: { min: 2, target: 5, max: 10 },
			printStroke: 'alternating',
			bladeType: 'metal',
			wipeMode: 'vacuum-dry',
			boardSupport: 'blocks'
		}
	},
	{
		line: 'SMT-3',
		product: 'LM-48',
		parameters: {
			squeegeeAngleDeg: { min: 45, target: 60, max: 60 },
			squeegeeSpeedMmS: { min: 20, target: 30, max: 50 },
			squeegeePressureKg: { min: 4, target: 5.5, max: 7 },
			separationSpeedMmS: { min: 0.5, target: 1, max: 3 },
			printStroke: 'front-to-back',
			bladeType: 'metal',
			wipeMode: 'dry',
			boardSupport: 'vacuum-fixture'
		}
	}
];

/** ISO date `days` from `nowMs` (UTC). */
const isoDate = (nowMs: number, days: number) =>
	new Date(nowMs + days * DAY).toISOString().slice(0, 10);

/** A small deterministic generator, so the demo looks the same on every start. */
function noise(seed: number) {
	let state = seed;
	return () => {
		state = (state * 1103515245 + 12345) % 2147483648;
		return state / 2147483648 - 0.5;
	};
}

/**
 * Seed the print-log demo: a recipe per demo line and product, three paste lots (a SAC305 lot
 * warmed up and ready, a leaded Sn63Pb37 lot in cold storage, an expired lot) and, when the
 * stencil demo made ST-PB100, two weeks of ended runs of PB-100 on SMT-1 on it (one with a
 * deviation and its reason). Invented data; times relative to `nowMs`.
 */
export function seedDemoPrintlog(db: Db, nowMs = Date.now()): void {
	for (const recipe of DEMO_RECIPES) {
		if (!lineByCode(db, recipe.line) || !productByCode(db, recipe.product)) continue;
		saveRecipe(db, { ...recipe, note: 'Demo recipe' } as Parameters<typeof saveRecipe>[1], null);
	}
	db.transaction((tx) => {
		const lot = (
			values: Omit<
				typeof pasteLots.$inferInsert,
				'warmUpMinutes' | 'maxOnStencilMinutes' | 'maxOutOfColdMinutes'
			>
		) =>
			tx
				.insert(pasteLots)
				.values({
					warmUpMinutes: 240,
					maxOnStencilMinutes: 480,
					maxOutOfColdMinutes: 1440,
					...values
				})
				.returning({ id: pasteLots.id })
				.get().id;
		const event = (lotId: number, name: string, at: number) =>
			tx
				.insert(pasteEvents)
				.values({ lotId, event: name, at: new Date(at), actor: 'system' })
				.run();
		const used = lot({
			lotNumber: 'PL-2026-0390',
			alloy: 'SAC305',
			powderType: 4,
			fluxClass: 'ROL0',
			containerGrams: 500,
			receivedOn: isoDate(nowMs, -40),
			expiresOn: isoDate(nowMs, 90)
		});
		const ready = lot({
			lotNumber: 'PL-2026-0412',
			alloy: 'SAC305',
			powderType: 4,
			fluxClass: 'ROL0',
			containerGrams: 500,
			receivedOn: isoDate(nowMs, -10),
			expiresOn: isoDate(nowMs, 150)
		});
		const leaded = lot({
			lotNumber: 'PL-2026-0398',
			alloy: 'Sn63Pb37',
			powderType: 3,
			fluxClass: 'ROL0',
			containerGrams: 500,
			receivedOn: isoDate(nowMs, -20),
			expiresOn: isoDate(nowMs, 120)
		});
		lot({
			lotNumber: 'PL-2025-0977',
			alloy: 'SAC305',
			powderType: 4,
			fluxClass: 'ROL0',
			containerGrams: 250,
			receivedOn: isoDate(nowMs, -220),
			expiresOn: isoDate(nowMs, -30)
		});
		event(used, 'out-of-cold-storage', nowMs - 15 * DAY);
		event(used, 'opened', nowMs - 15 * DAY + 5 * HOUR);
		event(used, 'on-stencil', nowMs - 15 * DAY + 5.5 * HOUR);
		event(used, 'discarded', nowMs - 1 * DAY);
		event(ready, 'out-of-cold-storage', nowMs - 5 * HOUR);
		void leaded;

		const stencil = tx
			.select({ id: stencils.id })
			.from(stencils)
			.where(eq(stencils.name, 'ST-PB100'))
			.orderBy(desc(stencils.id))
			.get();
		const line = lineByCode(tx as unknown as Db, 'SMT-1');
		const product = productByCode(tx as unknown as Db, 'PB-100');
		if (!stencil || !line || !product) return;
		const recipe = currentRecipeFor(tx as unknown as Db, line.id, product.id);
		if (!recipe) return;
		const jitter = noise(48);
		// Invented Fenmoor serials, numbered through the product's boards: each run logs its first.
		let boardsSoFar = 0;
		for (let i = 0; i < 14; i++) {
			const startedAt = nowMs - (14 - i) * DAY + 6 * HOUR;
			const parameters: Record<string, unknown> = {
				squeegeeAngleDeg: 60,
				squeegeeSpeedMmS: Math.round(40 + jitter() * 8),
				squeegeePressureKg: Math.round((7 + jitter() * 0.8) * 10) / 10,
				separationSpeedMmS: Math.round((1 + jitter() * 0.4) * 10) / 10,
				separationDistanceMm: 2,
				printGapMm: 0,
				bladeLengthMm: 300,
				wipeIntervalPrints: 3,
				printStroke: 'alternating',
				bladeType: 'metal',
				wipeMode: 'wet-vacuum-dry',
				boardSupport: 'pins'
			};
			// Day 9: a deliberate deviation with its reason, so the run list shows one.
			if (i === 9) parameters.squeegeeSpeedMmS = 65;
			const ambientTempC = Math.round((23 + jitter() * 3) * 10) / 10;
			const relativeHumidityPct = Math.round(45 + jitter() * 12);
			const check = checkRunAgainstRecipe(
				{ ...parameters, ambientTempC, relativeHumidityPct },
				{ line: line.code, product: product.code, parameters: recipe.parameters }
			);
			const reason = 'trial at higher speed for throughput, approved by process engineering';
			const boardsPrinted = 380 + Math.round(jitter() * 60);
			const boardSerial = `FW-PB100-${String(boardsSoFar + 1).padStart(7, '0')}`;
			boardsSoFar += boardsPrinted;
			tx.insert(printRuns)
				.values({
					lineId: line.id,
					productId: product.id,
					stencilId: stencil.id,
					pasteLotId: used,
					bladeCode: 'BL-300-07',
					boardSerial,
					recipeId: recipe.id,
					recipeVersion: recipe.version,
					parameters,
					ambientTempC,
					relativeHumidityPct,
					startedAt: new Date(startedAt),
					endedAt: new Date(startedAt + 7 * HOUR),
					boardsPrinted,
					deviations: check.deviations.map((d) => ({
						...d,
						reason: d.requiresReason ? reason : null
					})),
					deviationReasons: check.deviations.some((d) => d.requiresReason)
						? { squeegeeSpeedMmS: reason }
						: {}
				})
				.run();
		}
	});
}
