// Writes qfp45-strokes.gbr: a 44-pin QFP (11 pads a side, 0.8 mm pitch) rotated by 45°, every
// pad painted with five parallel D01 strokes of a 0.1 mm round pen (as some CAD tools export
// paste layers), plus a 20 × 20 mm board outline and a 5 mm fab line drawn on the same layer.
// Coordinates are written with 6 decimals (1 nm); run `node make-qfp45-strokes.mjs` to rewrite.
import { writeFileSync } from 'node:fs';

const fmt = (mm) => String(Math.round(mm * 1e6));
const lines = [
	'G04 QFP-44 rotated 45 degrees, pads painted as strokes; board outline and a fab line*',
	'%FSLAX46Y46*%',
	'%MOMM*%',
	'%ADD10C,0.1*%',
	'%ADD11C,0.15*%',
	'D10*',
	'G01*'
];
const [cx, cy] = [10, 10];
const rot = (x, y) => {
	const c = Math.SQRT1_2;
	return [cx + c * (x - y), cy + c * (x + y)];
};
for (let side = 0; side < 4; side++) {
	for (let m = 0; m < 11; m++) {
		// Local frame of side 0 (bottom): pad centre ((m − 5)·0.8, −5), long axis along y.
		const t = (m - 5) * 0.8;
		for (const off of [-0.1, -0.05, 0, 0.05, 0.1]) {
			const ends = [-0.6, 0.6].map((r) => {
				// Tangential coordinate t + off, radial −5 + r; then turned by side × 90°.
				let [x, y] = [t + off, -5 + r];
				for (let k = 0; k < side; k++) [x, y] = [-y, x];
				return rot(x, y);
			});
			lines.push(`X${fmt(ends[0][0])}Y${fmt(ends[0][1])}D02*`);
			lines.push(`X${fmt(ends[1][0])}Y${fmt(ends[1][1])}D01*`);
		}
	}
}
lines.push('D11*', 'X0Y0D02*', 'X20000000Y0D01*', 'Y20000000D01*', 'X0D01*', 'Y0D01*');
lines.push('X1000000Y18000000D02*', 'X6000000D01*', 'M02*');
writeFileSync(new URL('./qfp45-strokes.gbr', import.meta.url), lines.join('\n') + '\n');
