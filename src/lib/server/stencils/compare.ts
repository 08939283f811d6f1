import type { Db } from '../db';
import { compareRevisions, type RevisionComparison } from '$lib/stencil';
import { loadApertures } from './apertures';
import { getStencil, type StencilRecord } from './stencils';

/** Two stored stencils side by side: which apertures were added, removed or changed. */
export interface StoredRevisionComparison {
	old: StencilRecord;
	new: StencilRecord;
	comparison: RevisionComparison;
}

/**
 * Compare two stored stencils (normally two revisions of one name). Apertures are matched by
 * refdes and pad, then by position within 50 µm; figures are at each stencil's base thickness.
 * @throws StencilNotFoundError.
 * @example compareStoredRevisions(db, revA.id, revB.id).comparison.changed.length
 */
export function compareStoredRevisions(
	db: Db,
	oldId: number,
	newId: number
): StoredRevisionComparison {
	const oldStencil = getStencil(db, oldId);
	const newStencil = getStencil(db, newId);
	const comparison = compareRevisions(loadApertures(db, oldId), loadApertures(db, newId), {
		oldThicknessUm: oldStencil.thicknessUm,
		newThicknessUm: newStencil.thicknessUm
	});
	return { old: oldStencil, new: newStencil, comparison };
}
