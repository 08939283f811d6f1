import type { EvaluatedAperture } from '$lib/server/stencils/evaluation';
import { writeCsv, type CsvCell } from './write-csv';

// The first columns are our import layout in µm, so the file imports again with unit "um";
// the importer ignores the figure columns after them.
export const APERTURE_CSV_HEADER = [
	'refdes',
	'pad',
	'shape',
	'length',
	'width',
	'corner_radius',
	'diameter',
	'x',
	'y',
	'rotation',
	'vertices',
	'thickness_um',
	'area_um2',
	'perimeter_um',
	'area_ratio',
	'aspect_ratio',
	'volume_um3',
	'max_passing_thickness_um',
	'status',
	'reasons'
];

export type ApertureCsvInput = {
	stencil: { name: string; revision: string; thicknessUm: number; technology: string };
	thresholds: { minAreaRatio: number; minAspectRatio: number };
	apertures: readonly Pick<
		EvaluatedAperture,
		| 'refdes'
		| 'pad'
		| 'shape'
		| 'lengthUm'
		| 'widthUm'
		| 'cornerRadiusUm'
		| 'diameterUm'
		| 'xUm'
		| 'yUm'
		| 'rotationDeg'
		| 'verticesUm'
		| 'thicknessUm'
		| 'areaUm2'
		| 'perimeterUm'
		| 'areaRatio'
		| 'aspectRatio'
		| 'volumeUm3'
		| 'maxPassingThicknessUm'
		| 'status'
		| 'reasons'
	>[];
};

/**
 * The aperture table as CSV (unrounded numbers, lengths in µm). The first row is one `#` comment
 * cell naming the stencil (the importer skips it); like every cell it goes through the writer,
 * so a name with a line break or quote stays inside its cell.
 */
export function aperturesCsv(input: ApertureCsvInput): string {
	const { stencil: s, thresholds: t } = input;
	const comment = `# Rollbead aperture check: ${s.name} rev ${s.revision}, ${s.thicknessUm} µm ${s.technology}; lengths in µm; limits area ratio ${t.minAreaRatio}, aspect ratio ${t.minAspectRatio}`;
	const rows: CsvCell[][] = input.apertures.map((a) => [
		a.refdes,
		a.pad,
		a.shape,
		a.lengthUm,
		a.widthUm,
		a.cornerRadiusUm,
		a.diameterUm,
		a.xUm,
		a.yUm,
		a.rotationDeg,
		a.verticesUm?.map(([x, y]) => `${x} ${y}`).join(';'),
		a.thicknessUm,
		a.areaUm2,
		a.perimeterUm,
		a.areaRatio,
		a.aspectRatio,
		a.volumeUm3,
		a.maxPassingThicknessUm,
		a.status,
		a.reasons.map((r) => r.message).join('; ')
	]);
	return writeCsv([[comment], APERTURE_CSV_HEADER, ...rows]);
}
