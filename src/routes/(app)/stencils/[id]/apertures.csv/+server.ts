import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { checkStoredStencil, findStencil, type EvaluatedAperture } from '$lib/server/stencils';
import type { RequestHandler } from './$types';

// The first columns are our import layout in µm, so the file imports again with unit "um";
// the importer ignores the figure columns after them.
const HEADER = [
	'refdes', 'pad', 'shape', 'length', 'width', 'corner_radius', 'diameter', 'x', 'y', 'rotation',
	'vertices', 'thickness_um', 'area_um2', 'perimeter_um', 'area_ratio', 'aspect_ratio', 'volume_um3',
	'max_passing_thickness_um', 'status', 'reasons'
];

/** Quote a cell when needed; text that a spreadsheet would run as a formula gets a leading '. */
function cell(value: string | number | undefined | null, text = false): string {
	if (value === undefined || value === null) return '';
	let s = String(value);
	if (text && /^[=+\-@\t\r]/.test(s)) s = `'${s}`;
	return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

function row(a: EvaluatedAperture): string {
	return [
		cell(a.refdes, true),
		cell(a.pad, true),
		a.shape,
		cell(a.lengthUm),
		cell(a.widthUm),
		cell(a.cornerRadiusUm),
		cell(a.diameterUm),
		cell(a.xUm),
		cell(a.yUm),
		cell(a.rotationDeg),
		cell(a.verticesUm?.map(([x, y]) => `${x} ${y}`).join(';')),
		cell(a.thicknessUm),
		cell(a.areaUm2),
		cell(a.perimeterUm),
		cell(a.areaRatio),
		cell(a.aspectRatio),
		cell(a.volumeUm3),
		cell(a.maxPassingThicknessUm),
		a.status,
		cell(a.reasons.map((r) => r.message).join('; '), true)
	].join(',');
}

/** The aperture table as CSV (unrounded numbers, lengths in µm); `?status=fail` for failures only. */
export const GET: RequestHandler = ({ locals, params, url }) => {
	requireActor(locals);
	const id = Number(params.id);
	const db = getDb();
	if (!Number.isSafeInteger(id) || !findStencil(db, id)) error(404, 'No such stencil.');
	const check = checkStoredStencil(db, id);
	const only = url.searchParams.get('status');
	const list = only === 'fail' || only === 'pass' ? check.apertures.filter((a) => a.status === only) : check.apertures;
	const s = check.stencil;
	const lines = [
		`# Rollbead aperture check: ${s.name} rev ${s.revision}, ${s.thicknessUm} µm ${s.technology}; lengths in µm; limits area ratio ${check.thresholds.minAreaRatio}, aspect ratio ${check.thresholds.minAspectRatio}`,
		HEADER.join(','),
		...list.map(row)
	];
	const file = `${s.name}-rev-${s.revision}-apertures.csv`.replace(/[^\w.-]+/g, '_');
	return new Response(lines.join('\r\n') + '\r\n', {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${file}"`
		}
	});
};
