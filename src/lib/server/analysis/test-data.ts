import { predictTe, seededRandom, type TeCurve } from '$lib/analysis';
import type { StencilTechnology } from '$lib/stencil';
import type { Db } from '../db';
import { ingestSpiFile } from '../ingest/ingest-service';
import { importApertures } from '../stencils/apertures';
import { createStencil } from '../stencils/stencils';

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result,volume_um3,stencil';

/**
 * A test stencil of round apertures (AR = D/4T) from `arFrom` to `arTo` and `boards` inspected
 * boards whose deposits follow `curve` (volume_um3 = TE × aperture volume) with seeded noise.
 * volume_pct is written as a constant 100 on purpose: TE must not be read from it.
 */
export async function seedTeTestData(
	db: Db,
	options: {
		curve: TeCurve;
		name?: string;
		product?: string;
		technology?: StencilTechnology;
		thicknessUm?: number;
		boards?: number;
		apertures?: number;
		arFrom?: number;
		arTo?: number;
		sdTe?: number;
		startMs?: number;
		seed?: number;
	}
) {
	const name = options.name ?? 'ST-TE';
	const product = options.product ?? 'TE-1';
	const t = options.thicknessUm ?? 100;
	const count = options.apertures ?? 26;
	const arFrom = options.arFrom ?? 0.35;
	const arTo = options.arTo ?? 1.6;
	const stencil = createStencil(
		db,
		{
			name,
			revision: 'A',
			thicknessUm: t,
			technology: options.technology ?? 'electroformed',
			notes: ''
		},
		null
	);
	const apertures = Array.from({ length: count }, (_, i) => {
		const ar = arFrom + ((arTo - arFrom) * i) / (count - 1);
		return {
			refdes: `U${i + 1}`,
			pad: '1',
			shape: 'circle' as const,
			diameterUm: 4 * t * ar,
			xUm: 1000 + i * 3000,
			yUm: 1000,
			rotationDeg: 0,
			ar,
			volumeUm3: Math.PI * (2 * t * ar) ** 2 * t
		};
	});
	importApertures(
		db,
		stencil.id,
		apertures.map(({ ar: _ar, volumeUm3: _v, ...a }) => a),
		{ source: 'json', mode: 'append', fileName: 'test' },
		null
	);
	const rng = seededRandom(options.seed ?? 1);
	const lines = [HEADER];
	const boards = options.boards ?? 40;
	const start = options.startMs ?? Date.UTC(2026, 2, 1, 6);
	const expected: { ar: number; te: number }[] = [];
	for (let b = 0; b < boards; b++) {
		const at = new Date(start + b * 60_000).toISOString();
		for (const a of apertures) {
			const te = Math.max(
				0.01,
				predictTe(options.curve, a.ar) + (options.sdTe ?? 0.05) * rng.normal()
			);
			const um3 = Math.round(te * a.volumeUm3);
			expected.push({ ar: a.ar, te: um3 / a.volumeUm3 });
			lines.push(
				`${name}-B${b + 1},${at},SMT-9,${product},0,${a.refdes},${a.pad},100,100,${t},0,0,pass,${um3},${name}`
			);
		}
	}
	const text = lines.join('\n') + '\n';
	const outcome = await ingestSpiFile(db, {
		source: 'api',
		fileName: `${name}.csv`,
		body: (async function* () {
			yield new TextEncoder().encode(text);
		})(),
		createdBy: 'system'
	});
	if (outcome.status !== 'imported')
		throw new Error(`test data not imported: ${JSON.stringify(outcome)}`);
	return { stencil, expected };
}
