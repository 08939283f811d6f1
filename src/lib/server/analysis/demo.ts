import { eq } from 'drizzle-orm';
import { checkRunAgainstRecipe } from '$lib/printlog';
import { predictTe, seededRandom, type TeCurve } from '$lib/analysis';
import type { ApertureInput } from '$lib/stencil';
import type { Db } from '../db';
import { pasteLots, printRuns, users } from '../db/schema';
import { ingestSpiFile } from '../ingest/ingest-service';
import { lineByCode, productByCode } from '../printlog/lookups';
import { currentRecipeFor } from '../printlog/recipes';
import { importApertures } from '../stencils/apertures';
import { checkStoredStencil } from '../stencils/evaluation';
import { createStencil } from '../stencils/stencils';

const HOUR = 3_600_000;
const DAY = 24 * HOUR;
const RUNS = 24;
const BOARDS_PER_RUN = 12;
const THICKNESS_UM = 100;
const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result,volume_um3,stencil';

/** Invented print behaviour of the demo: the knee moves to smaller AR with finer powder. */
const DEMO_CURVE: Record<4 | 5, TeCurve> = {
	4: { upper: 0.98, lower: 0.38, knee: 0.6, scale: 0.05 },
	5: { upper: 0.98, lower: 0.42, knee: 0.53, scale: 0.05 }
};

/**
 * The SH-220 sensor hub's paste layer (invented): 33 wafer-level packages of 2 × 4 round pads
 * whose diameters step from 160 to 480 µm (area ratio 0.40–1.20 on a 100 µm foil), 20 0402 chips
 * and a thermal pad, so the site's own data cover the knee of transfer efficiency.
 */
function sh220Apertures(): ApertureInput[] {
	const out: ApertureInput[] = [];
	for (let k = 0; k < 33; k++) {
		const d = 160 + 10 * k;
		const pitch = Math.max(400, Math.round(d * 1.8));
		const cx = 6000 + (k % 11) * 8000;
		const cy = 8000 + Math.floor(k / 11) * 9000;
		for (let r = 0; r < 2; r++)
			for (let c = 0; c < 4; c++)
				out.push({
					refdes: `U${k + 1}`,
					pad: `${'AB'[r]}${c + 1}`,
					shape: 'circle',
					diameterUm: d,
					xUm: cx + (c - 1.5) * pitch,
					yUm: cy + (r - 0.5) * pitch,
					rotationDeg: 0
				});
	}
	for (let i = 0; i < 20; i++)
		for (const side of [-1, 1])
			out.push({
				refdes: `C${i + 1}`,
				pad: side < 0 ? '1' : '2',
				shape: 'rectangle',
				lengthUm: 450,
				widthUm: 500,
				xUm: 6000 + (i % 10) * 8000 + side * 500,
				yUm: 40000 + Math.floor(i / 10) * 4000,
				rotationDeg: 0
			});
	out.push({
		refdes: 'U40',
		pad: 'EP',
		shape: 'rectangle',
		lengthUm: 2000,
		widthUm: 2000,
		xUm: 90000,
		yUm: 50000,
		rotationDeg: 0
	});
	return out;
}

/**
 * Demo data for the analysis pages (Fenmoor Works, invented): the ST-SH220 stencil, a finer
 * SAC305 Type 5 paste lot beside the Type 4 one, 24 ended SH-220 runs on SMT-2 whose logged
 * parameters vary inside the recipe, and 12 inspected boards per run through the real ingest.
 * Deposits follow a knee in area ratio (finer powder prints smaller openings), slower squeegee
 * and lighter pressure print a little more, the stencil loses a little TE with use and paste
 * builds up between wipes, so the transfer-efficiency model, the parameter scatter, the stencil
 * wear and the board trace show something real.
 * Does nothing when SMT-2, SH-220, its recipe or the Type 4 demo lot is missing.
 */
export async function seedDemoAnalysis(db: Db, nowMs = Date.now()): Promise<void> {
	const line = lineByCode(db, 'SMT-2');
	const product = productByCode(db, 'SH-220');
	if (!line || !product) return;
	const recipe = currentRecipeFor(db, line.id, product.id);
	const t4 = db.select().from(pasteLots).where(eq(pasteLots.lotNumber, 'PL-2026-0390')).get();
	if (!recipe || !t4) return;
	const operator = db
		.select()
		.from(users)
		.where(eq(users.email, 'technician@fenmoor.example'))
		.get();

	const stencil = createStencil(
		db,
		{
			name: 'ST-SH220',
			revision: 'A',
			thicknessUm: THICKNESS_UM,
			technology: 'laser-stainless',
			ratedLifePrints: 60_000,
			notes: 'SH-220 sensor hub, top side: wafer-level packages from 160 to 480 µm.'
		},
		null
	);
	importApertures(
		db,
		stencil.id,
		sh220Apertures(),
		{ source: 'json', mode: 'append', fileName: 'demo data' },
		null
	);
	const apertures = checkStoredStencil(db, stencil.id).apertures;
	const t5 = db
		.insert(pasteLots)
		.values({
			lotNumber: 'PL-2026-0421',
			alloy: 'SAC305',
			powderType: 5,
			fluxClass: 'ROL0',
			containerGrams: 500,
			receivedOn: new Date(nowMs - 30 * DAY).toISOString().slice(0, 10),
			expiresOn: new Date(nowMs + 150 * DAY).toISOString().slice(0, 10),
			warmUpMinutes: 240,
			maxOnStencilMinutes: 480,
			maxOutOfColdMinutes: 1440
		})
		.returning()
		.get();

	const rng = seededRandom(20260421);
	const lines = [HEADER];
	let serial = 0;
	for (let i = 0; i < RUNS; i++) {
		const startedAt = nowMs - (RUNS - i) * DAY + 14 * HOUR;
		const lot = i % 2 === 0 ? t4 : t5;
		// Spread inside the SH-220 recipe windows, so no run carries a deviation.
		const speed = Math.round(28 + 50 * rng.uniform());
		const pressure = Math.round((4.6 + 3.3 * rng.uniform()) * 10) / 10;
		const parameters: Record<string, unknown> = {
			squeegeeAngleDeg: 60,
			squeegeeSpeedMmS: speed,
			squeegeePressureKg: pressure,
			separationSpeedMmS: Math.round((0.6 + 2.3 * rng.uniform()) * 10) / 10,
			wipeIntervalPrints: 2 + Math.floor(9 * rng.uniform()),
			printStroke: 'alternating',
			bladeType: 'metal',
			wipeMode: 'vacuum-dry',
			boardSupport: 'blocks'
		};
		const ambientTempC = Math.round((21.5 + 4 * rng.uniform()) * 10) / 10;
		const relativeHumidityPct = Math.round(36 + 22 * rng.uniform());
		const check = checkRunAgainstRecipe(
			{ ...parameters, ambientTempC, relativeHumidityPct },
			{ line: line.code, product: product.code, parameters: recipe.parameters }
		);
		const firstSerial = `FW-SH220-${String(serial + 1).padStart(7, '0')}`;
		const run = db
			.insert(printRuns)
			.values({
				lineId: line.id,
				productId: product.id,
				stencilId: stencil.id,
				pasteLotId: lot.id,
				bladeCode: 'BL-250-03',
				boardSerial: firstSerial,
				recipeId: recipe.id,
				recipeVersion: recipe.version,
				parameters,
				ambientTempC,
				relativeHumidityPct,
				operatorUserId: operator?.id ?? null,
				startedAt: new Date(startedAt),
				endedAt: new Date(startedAt + 5 * HOUR),
				boardsPrinted: BOARDS_PER_RUN,
				deviations: check.deviations.map((d) => ({ ...d, reason: null }))
			})
			.returning({ id: printRuns.id })
			.get();
		void run;
		// Invented process response: TE × (1 − 0.0035/(mm/s) above 50 mm/s − 0.025/kg above 6 kg),
		// and 2 % lost over the 24 runs as the foil wears.
		const runFactor =
			(1 - 0.0035 * (speed - 50) - 0.025 * (pressure - 6)) * (1 - 0.02 * (i / RUNS));
		const curve = DEMO_CURVE[lot.powderType === 5 ? 5 : 4];
		for (let b = 0; b < BOARDS_PER_RUN; b++) {
			serial++;
			const at = new Date(startedAt + ((b + 0.5) / BOARDS_PER_RUN) * 5 * HOUR).toISOString();
			// Paste builds up under the foil between wipes: about 0.8 % more per print since the last.
			const sinceWipe = b % (parameters.wipeIntervalPrints as number);
			const boardFactor = (1 + 0.015 * rng.normal()) * (1 + 0.008 * sinceWipe);
			for (const a of apertures) {
				const base = predictTe(curve, a.areaRatio);
				// Deposits scatter more below the knee (REFERENCE-FACTS §f).
				const sd = 0.05 + 0.12 * (1 - (base - curve.lower) / (curve.upper - curve.lower));
				const te = Math.max(0.05, base * runFactor * boardFactor + sd * rng.normal());
				const vol = Math.min(400, te * 100);
				const area = Math.min(400, Math.max(5, 100 + 4 * rng.normal()));
				const height = Math.max(10, a.thicknessUm * (vol / area) + 3 * rng.normal());
				const result = vol < 50 || vol > 150 ? 'fail' : vol < 65 || vol > 135 ? 'warn' : 'pass';
				lines.push(
					[
						`FW-SH220-${String(serial).padStart(7, '0')}`,
						at,
						'SMT-2',
						'SH-220',
						0,
						a.refdes,
						a.pad,
						vol.toFixed(2),
						area.toFixed(2),
						height.toFixed(2),
						(12 * rng.normal()).toFixed(2),
						(12 * rng.normal()).toFixed(2),
						result,
						Math.round(te * a.volumeUm3),
						'ST-SH220'
					].join(',')
				);
			}
		}
	}
	const text = lines.join('\n') + '\n';
	await ingestSpiFile(db, {
		source: 'api',
		fileName: 'smt2-spi-demo.csv',
		body: (async function* () {
			yield new TextEncoder().encode(text);
		})(),
		createdBy: 'system'
	});
}
