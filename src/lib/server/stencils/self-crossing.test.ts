import { readFileSync } from 'node:fs';
import { afterEach, beforeEach, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import type { Actor } from '$lib/access';
import { apertureGeometry } from '$lib/stencil/geometry';
import { importGerberPasteLayer } from '$lib/stencil/gerber-import';
import { createStencil, importApertures, loadApertures } from './index';

// Repaired self-crossing contours and cut-ins are simple polygons the store accepts (it checks
// every outline for crossing edges); areas as derived in reference/gerber/README.md.
const engineer: Actor = { kind: 'user', id: 1, email: 'e@x', name: 'E', role: 'engineer' };
let db: Db;
let close: () => void;
beforeEach(() => {
	({ db, close } = openTestDatabase());
	db.$client
		.prepare(
			"insert into users (id, email, name, role, password_hash) values (1, 'e@x', 'E', 'engineer', 'x')"
		)
		.run();
});
afterEach(() => close());

for (const [file, areasUm2] of [
	['cut-in.gbr', [67_999_990, 106_999_940]],
	['self-overlapping-loop.gbr', [11_000_000]]
] as const) {
	it(`stores the openings of ${file} (${areasUm2.join(', ')} µm²)`, () => {
		const r = importGerberPasteLayer(readFileSync(`reference/gerber/${file}`, 'utf8'));
		if ('errors' in r) throw new Error(JSON.stringify(r.errors));
		const s = createStencil(
			db,
			{ name: 'ST-X', revision: 'A', thicknessUm: 120, technology: 'laser-stainless' },
			engineer
		);
		importApertures(db, s.id, r.apertures, { source: 'gerber', mode: 'replace' }, engineer);
		const stored = loadApertures(db, s.id).map((a) => apertureGeometry(a).areaUm2);
		expect(stored.sort((a, b) => a - b)).toHaveLength(areasUm2.length);
		stored.forEach((a, i) => expect(Math.abs(a - areasUm2[i])).toBeLessThanOrEqual(0.01));
	});
}
