import { error } from '@sveltejs/kit';
import { apertureBoundsUm, apertureSvgPath } from '$lib/stencil';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { getBoard, searchBoards } from '$lib/server/ingest';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	requireActor(locals);
	const id = Number(params.id);
	const found = getBoard(getDb(), id);
	if (!found) error(404, `No board inspection ${params.id}.`);
	// Outlines are computed here (pure $lib/stencil) so the page only draws paths.
	let map: {
		bounds: { x: number; y: number; w: number; h: number };
		marks: {
			d: string;
			refdes: string;
			pad: string;
			volumePct: number | null;
			result: string | null;
		}[];
	} | null = null;
	if (found.map && found.map.length > 0) {
		let minX = Infinity;
		let minY = Infinity;
		let maxX = -Infinity;
		let maxY = -Infinity;
		const marks = [];
		for (const m of found.map) {
			try {
				const b = apertureBoundsUm(m.aperture);
				minX = Math.min(minX, b.xMinUm);
				minY = Math.min(minY, b.yMinUm);
				maxX = Math.max(maxX, b.xMaxUm);
				maxY = Math.max(maxY, b.yMaxUm);
				marks.push({
					d: apertureSvgPath(m.aperture),
					refdes: m.aperture.refdes,
					pad: m.aperture.pad,
					volumePct: m.volumePct,
					result: m.result
				});
			} catch {
				// An aperture with invalid geometry is left off the map (the stencil page reports it).
			}
		}
		const pad = Math.max(maxX - minX, maxY - minY) * 0.03 || 1000;
		map = {
			bounds: { x: minX - pad, y: minY - pad, w: maxX - minX + 2 * pad, h: maxY - minY + 2 * pad },
			marks
		};
	}
	const others = searchBoards(getDb(), { serial: found.board.serial, limit: 20 }).filter(
		(b) => b.id !== id
	);
	return { board: found.board, pads: found.pads, map, others };
};
