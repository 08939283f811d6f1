import { parseLengthUnit, type LengthUnit } from '../units';
import { CANONICAL_FIELDS, type CanonicalField } from './canonical-fields';

/** Proposed mapping for the column-mapping screen; the user confirms or edits it. */
export interface ColumnMappingSuggestion {
	/** Source header per canonical field, for the fields that matched. */
	columns: Partial<Record<CanonicalField, string>>;
	/** Match score 0–1 per mapped field (1 = exact name or known synonym). */
	confidence: Partial<Record<CanonicalField, number>>;
	/** Headers that matched no field. */
	unmatched: string[];
	/** Length unit written in a height/offset header, e.g. `Height(mm)` → 'mm'; null if none. */
	lengthUnitHint: LengthUnit | null;
}

// Known names per field, already in normalised form (see normalise). Rollbead's own list of
// everyday words for these quantities, not taken from any product's export.
const SYNONYMS: Record<CanonicalField, string[]> = {
	board_serial: [
		'board serial',
		'serial',
		'serial number',
		'sn',
		'barcode',
		'board id',
		'pcb id',
		'pcb serial',
		'board barcode',
		'board sn'
	],
	inspected_at: [
		'inspected at',
		'timestamp',
		'time',
		'date time',
		'datetime',
		'inspection time',
		'inspection date',
		'date',
		'time stamp',
		'measured at'
	],
	line: ['line', 'line name', 'line id', 'smt line', 'line code'],
	product: [
		'product',
		'product code',
		'program',
		'program name',
		'recipe',
		'job',
		'assembly',
		'board name',
		'model'
	],
	panel_index: [
		'panel index',
		'panel',
		'array',
		'array index',
		'board index',
		'block',
		'circuit',
		'panel no',
		'array no',
		'sub board'
	],
	refdes: [
		'refdes',
		'ref des',
		'reference',
		'designator',
		'component',
		'comp',
		'part',
		'location',
		'reference designator',
		'comp name',
		'component name'
	],
	pad: ['pad', 'pin', 'pad id', 'pad name', 'pad no', 'pin no', 'pin name', 'pad number'],
	volume_pct: [
		'volume pct',
		'volume',
		'vol pct',
		'vol',
		'volume percent',
		'volume ratio',
		'vol ratio',
		'transfer efficiency',
		'te'
	],
	area_pct: ['area pct', 'area', 'area percent', 'area ratio'],
	height_um: [
		'height um',
		'height',
		'height mm',
		'height mil',
		'thickness',
		'paste height',
		'avg height',
		'average height',
		'mean height'
	],
	offset_x_um: [
		'offset x um',
		'offset x',
		'x offset',
		'shift x',
		'x shift',
		'dx',
		'delta x',
		'pos x',
		'position x',
		'offset x mm',
		'offset x mil'
	],
	offset_y_um: [
		'offset y um',
		'offset y',
		'y offset',
		'shift y',
		'y shift',
		'dy',
		'delta y',
		'pos y',
		'position y',
		'offset y mm',
		'offset y mil'
	],
	result: [
		'result',
		'judgement',
		'judgment',
		'status',
		'pass fail',
		'verdict',
		'decision',
		'ok ng',
		'outcome'
	],
	volume_um3: [
		'volume um3',
		'vol um3',
		'volume abs',
		'absolute volume',
		'volume um 3',
		'volume mil3',
		'vol mil3'
	],
	stencil: ['stencil', 'stencil id', 'stencil name', 'stencil serial', 'foil'],
	print_run: ['print run', 'run', 'run id', 'lot', 'batch', 'work order']
};

/** Lower case, µ → u, ³ → 3, % → ' pct', everything else not alphanumeric → single space. */
function normalise(header: string): string {
	return header
		.toLowerCase()
		.replace(/[µμ]/g, 'u')
		.replace(/³/g, '3')
		.replace(/%/g, ' pct ')
		.replace(/([a-z])([0-9])/g, '$1 $2')
		.replace(/[^a-z0-9]+/g, ' ')
		.trim()
		.replace(/\bu m\b/g, 'um')
		.replace(/\b(um|mil) 3\b/g, '$13');
}

function bigrams(s: string): Map<string, number> {
	const m = new Map<string, number>();
	const t = s.replace(/ /g, '');
	for (let i = 0; i < t.length - 1; i++) {
		const g = t.slice(i, i + 2);
		m.set(g, (m.get(g) ?? 0) + 1);
	}
	return m;
}

/** Sørensen–Dice coefficient on character bigrams (0–1); tolerant of typos and word order. */
function dice(a: string, b: string): number {
	const ga = bigrams(a);
	const gb = bigrams(b);
	let total = 0;
	let shared = 0;
	for (const v of ga.values()) total += v;
	for (const [g, v] of gb) {
		total += v;
		shared += Math.min(v, ga.get(g) ?? 0);
	}
	return total === 0 ? 0 : (2 * shared) / total;
}

/**
 * 1 − (optimal string alignment distance / longer length): edits, with swaps of adjacent
 * letters counting once (Damerau), so "hieght" is close to "height". Spaces are ignored.
 */
function editSimilarity(a: string, b: string): number {
	const x = a.replace(/ /g, '');
	const y = b.replace(/ /g, '');
	const longest = Math.max(x.length, y.length);
	if (longest === 0) return 0;
	const d: number[][] = Array.from({ length: x.length + 1 }, (_, i) => [i]);
	for (let j = 1; j <= y.length; j++) d[0][j] = j;
	for (let i = 1; i <= x.length; i++) {
		for (let j = 1; j <= y.length; j++) {
			const cost = x[i - 1] === y[j - 1] ? 0 : 1;
			d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost);
			if (i > 1 && j > 1 && x[i - 1] === y[j - 2] && x[i - 2] === y[j - 1]) {
				d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
			}
		}
	}
	return 1 - d[x.length][y.length] / longest;
}

function score(header: string, field: CanonicalField): number {
	const h = normalise(header);
	if (h === '') return 0;
	const names = [field.replace(/_/g, ' '), ...SYNONYMS[field]];
	if (names.includes(h)) return 1;
	// Same words, extra decoration (units in brackets, "avg"): strong but not exact.
	const words = new Set(h.split(' '));
	let best = 0;
	for (const name of names) {
		const nameWords = name.split(' ');
		if (nameWords.every((w) => words.has(w)))
			best = Math.max(best, 0.7 + 0.2 * (nameWords.length / words.size));
		else best = Math.max(best, 0.8 * Math.max(dice(h, name), editSimilarity(h, name)));
	}
	// A % sign or a cubic unit decides between the two volume fields.
	if (field === 'volume_pct' && /\b(um3|mil3)\b/.test(h)) best *= 0.5;
	if (field === 'volume_um3' && words.has('pct')) best *= 0.5;
	return Math.min(best, 0.95);
}

/**
 * Propose a canonical field for each header of an unknown export, e.g. `Volume(%)` →
 * `volume_pct`, `X Offset (mm)` → `offset_x_um` with `lengthUnitHint: 'mm'`. Scores every
 * header/field pair (exact name or synonym = 1, all words of a synonym present ≈ 0.7–0.9,
 * otherwise 0.8 × the better of bigram Dice similarity and edit similarity, which forgives
 * typos like "Hieght") and assigns greedily, best score first, each header
 * and field once, keeping scores ≥ 0.55. O(headers × fields × synonyms).
 * Used by the mapping screen; the user always confirms.
 * @example suggestColumnMapping(['Serial', 'Volume(%)']).columns // { board_serial: 'Serial', volume_pct: 'Volume(%)' }
 */
export function suggestColumnMapping(headers: readonly string[]): ColumnMappingSuggestion {
	const pairs: { header: string; field: CanonicalField; score: number }[] = [];
	for (const header of headers) {
		for (const field of CANONICAL_FIELDS) {
			const s = score(header, field);
			if (s >= 0.55) pairs.push({ header, field, score: s });
		}
	}
	pairs.sort((a, b) => b.score - a.score);
	const columns: Partial<Record<CanonicalField, string>> = {};
	const confidence: Partial<Record<CanonicalField, number>> = {};
	const usedHeaders = new Set<string>();
	for (const p of pairs) {
		if (columns[p.field] !== undefined || usedHeaders.has(p.header)) continue;
		columns[p.field] = p.header;
		confidence[p.field] = Math.round(p.score * 100) / 100;
		usedHeaders.add(p.header);
	}
	let lengthUnitHint: LengthUnit | null = null;
	for (const field of ['height_um', 'offset_x_um', 'offset_y_um'] as const) {
		const header = columns[field];
		const unit = header ? /[([]\s*([^)\]]+?)\s*[)\]]/.exec(header)?.[1] : undefined;
		const parsed = unit ? parseLengthUnit(unit) : null;
		if (parsed && parsed !== 'inch') {
			lengthUnitHint = parsed;
			break;
		}
	}
	return {
		columns,
		confidence,
		unmatched: headers.filter((h) => !usedHeaders.has(h)),
		lengthUnitHint
	};
}
