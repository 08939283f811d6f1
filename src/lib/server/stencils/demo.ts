import type { Db } from '../db';
import type { ApertureInput } from '$lib/stencil';
import { importApertures } from './apertures';
import { createRevision, createStencil } from './stencils';

/** One pad pair of a two-terminal chip (rectangles), pads along x. */
function chip(
	refdes: string,
	x: number,
	y: number,
	pitchUm: number,
	lengthUm: number,
	widthUm: number
): ApertureInput[] {
	return [-1, 1].map((side, k) => ({
		refdes,
		pad: String(k + 1),
		shape: 'rectangle',
		lengthUm,
		widthUm,
		xUm: x + (side * pitchUm) / 2,
		yUm: y,
		rotationDeg: 0
	}));
}

/** A QFN: `perSide` pads on each side at `pitchUm`, plus a 2 × 2 window-pane thermal pad. */
function qfn(
	refdes: string,
	x: number,
	y: number,
	perSide: number,
	pitchUm: number,
	padL: number,
	padW: number
) {
	const out: ApertureInput[] = [];
	const span = ((perSide - 1) * pitchUm) / 2;
	const edge = span + 900;
	let pad = 1;
	for (const [dx, dy, rot] of [
		[-1, 0, 0],
		[0, -1, 90],
		[1, 0, 0],
		[0, 1, 90]
	] as const)
		for (let i = 0; i < perSide; i++) {
			const along = -span + i * pitchUm;
			out.push({
				refdes,
				pad: String(pad++),
				shape: 'rectangle',
				lengthUm: padL,
				widthUm: padW,
				xUm: x + (dx !== 0 ? dx * edge : along),
				yUm: y + (dy !== 0 ? dy * edge : along),
				rotationDeg: rot
			});
		}
	for (const [dx, dy] of [
		[-1, -1],
		[1, -1],
		[-1, 1],
		[1, 1]
	])
		out.push({
			refdes,
			pad: `EP${out.length - 4 * perSide + 1}`,
			shape: 'rectangle',
			lengthUm: 1200,
			widthUm: 1200,
			xUm: x + dx * 750,
			yUm: y + dy * 750,
			rotationDeg: 0
		});
	return out;
}

/** A BGA: n × n round apertures at `pitchUm`, pads named A1, A2 … */
function bga(refdes: string, x: number, y: number, n: number, pitchUm: number, diameterUm: number) {
	const rows = 'ABCDEFGHJKLMNPRT';
	const out: ApertureInput[] = [];
	for (let r = 0; r < n; r++)
		for (let c = 0; c < n; c++)
			out.push({
				refdes,
				pad: `${rows[r]}${c + 1}`,
				shape: 'circle',
				diameterUm,
				xUm: x + (c - (n - 1) / 2) * pitchUm,
				yUm: y - (r - (n - 1) / 2) * pitchUm,
				rotationDeg: 0
			});
	return out;
}

/**
 * The invented PB-100 pump controller board's top paste layer, generated procedurally: 0402 and
 * 0201 chips, SOIC-8s, a 0.4 mm-pitch QFN-32, a 0.5 mm-pitch 8 × 8 BGA, an obround connector row
 * and home-plate polygons. `qfnPadWidthUm` is what rev B widens.
 */
export function demoPb100Apertures(qfnPadWidthUm = 220): ApertureInput[] {
	const out: ApertureInput[] = [];
	for (let i = 0; i < 60; i++)
		out.push(
			...chip(`C${i + 1}`, 8000 + (i % 12) * 3000, 8000 + Math.floor(i / 12) * 2500, 1000, 500, 550)
		);
	for (let i = 0; i < 30; i++)
		out.push(
			...chip(`R${i + 1}`, 8000 + (i % 10) * 2000, 24000 + Math.floor(i / 10) * 1500, 500, 280, 300)
		);
	for (let i = 0; i < 4; i++) {
		const x = 50000 + i * 9000;
		for (let p = 0; p < 8; p++) {
			const left = p < 4;
			out.push({
				refdes: `U${i + 3}`,
				pad: String(p + 1),
				shape: 'rectangle',
				lengthUm: 1550,
				widthUm: 600,
				xUm: x + (left ? -2700 : 2700),
				yUm: 10000 + (left ? 1905 - p * 1270 : -1905 + (p - 4) * 1270),
				rotationDeg: 0
			});
		}
	}
	out.push(...qfn('U1', 20000, 45000, 8, 400, 700, qfnPadWidthUm));
	out.push(...bga('U2', 45000, 45000, 8, 500, 300));
	for (let p = 0; p < 10; p++)
		out.push({
			refdes: 'J1',
			pad: String(p + 1),
			shape: 'rounded-rectangle',
			lengthUm: 1800,
			widthUm: 900,
			cornerRadiusUm: 450,
			xUm: 70000,
			yUm: 30000 + p * 2540,
			rotationDeg: 90
		});
	for (let k = 0; k < 4; k++)
		out.push({
			refdes: `Q${k + 1}`,
			pad: '2',
			shape: 'polygon',
			verticesUm: [
				[-1600, -900],
				[1600, -900],
				[1600, 500],
				[0, 900],
				[-1600, 500]
			],
			xUm: 8000 + k * 6000,
			yUm: 60000,
			rotationDeg: 0
		});
	return out;
}

/**
 * Seed the demo stencils: ST-PB100 rev A (127 µm laser-cut stainless: the 0201s, the QFN and the
 * BGA fail) and rev B (a 100 µm step over the BGA, wider QFN pads), so the list, the check, the
 * history and the comparison all have something to show. Invented data (Fenmoor Works).
 */
export function seedDemoStencils(db: Db): void {
	const a = createStencil(
		db,
		{
			name: 'ST-PB100',
			revision: 'A',
			thicknessUm: 127,
			technology: 'laser-stainless',
			ratedLifePrints: 80_000,
			notes: 'PB-100 pump controller, top side. First article.'
		},
		null
	);
	importApertures(
		db,
		a.id,
		demoPb100Apertures(220),
		{ source: 'json', mode: 'append', fileName: 'demo data' },
		null
	);
	const b = createRevision(
		db,
		a.id,
		{
			revision: 'B',
			thicknessUm: 127,
			technology: 'step',
			notes: 'Step-down to 100 µm over U2 (0.5 mm BGA); U1 pads widened.',
			stepRegions: [
				{ xMinUm: 42500, yMinUm: 42500, xMaxUm: 47500, yMaxUm: 47500, thicknessUm: 100 }
			]
		},
		null
	);
	importApertures(
		db,
		b.id,
		demoPb100Apertures(250),
		{ source: 'json', mode: 'replace', fileName: 'demo data rev B' },
		null
	);
}
