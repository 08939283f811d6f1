/**
 * Canvas drawing of the aperture map. All outlines of one status are one Path2D (parsed once per
 * data change from the server's path text), filled in one call; failing ones with a hatch
 * pattern. A zoom or pan frame draws the last full rendering moved and scaled (one drawImage, well
 * under a millisecond); a full rendering follows once the view has been still for a moment.
 */

/** The visible window in user units (µm, y flipped: y = −stencil y). */
export interface ViewBox {
	x: number;
	y: number;
	w: number;
	h: number;
}

/** Colours read from the legend (theme aware). */
export interface MapColours {
	pass: string;
	hatchBack: string;
	hatchLine: string;
	outline: string;
	select: string;
}

/** User units per CSS pixel, and the user point at the canvas's top-left corner. */
export interface MapTransform {
	scale: number;
	ox: number;
	oy: number;
}

/** A highlighted outline: SVG path data, colour and line width in CSS pixels. */
export type Highlight = { d: string; colour: string; px: number };

/** The view letterboxed into a width × height box ("meet"). */
export function frameFor(v: ViewBox, width: number, height: number): MapTransform {
	const scale = Math.max(v.w / width, v.h / height);
	return { scale, ox: v.x - (width * scale - v.w) / 2, oy: v.y - (height * scale - v.h) / 2 };
}

/** A screen-space hatch (stripes every 6 px at 45°) as a canvas pattern. */
function hatchPattern(
	ctx: CanvasRenderingContext2D,
	dpr: number,
	colours: MapColours
): CanvasPattern | string {
	const n = Math.max(4, Math.round(6 * dpr));
	const tile = document.createElement('canvas');
	tile.width = tile.height = n;
	const t = tile.getContext('2d');
	if (!t) return colours.hatchLine;
	t.fillStyle = colours.hatchBack;
	t.fillRect(0, 0, n, n);
	t.strokeStyle = colours.hatchLine;
	t.lineWidth = n / 3;
	t.beginPath();
	for (const k of [-n, 0, n]) {
		t.moveTo(k, n);
		t.lineTo(k + n, 0);
	}
	t.stroke();
	return ctx.createPattern(tile, 'repeat') ?? colours.hatchLine;
}

const dprOf = () => window.devicePixelRatio || 1;

/** Paints one canvas; keeps the last full rendering for cheap zoom and pan frames. */
export class MapPainter {
	private drawn: { vb: ViewBox; image: HTMLCanvasElement } | null = null;

	constructor(private readonly canvas: HTMLCanvasElement) {}

	/** Forget the kept rendering (the canvas was resized). */
	reset(): void {
		this.drawn = null;
	}

	get hasRendering(): boolean {
		return this.drawn !== null;
	}

	/** Draw everything for the view (about 10–30 ms for 20,000 outlines); null when hidden. */
	full(
		vb: ViewBox,
		shapes: { pass: Path2D; fail: Path2D },
		colours: MapColours,
		highlights: Highlight[]
	): MapTransform | null {
		const { canvas } = this;
		const ctx = canvas.getContext('2d');
		const [w, h] = [canvas.clientWidth, canvas.clientHeight];
		if (!ctx || w === 0 || h === 0) return null;
		const dpr = dprOf();
		if (canvas.width !== Math.round(w * dpr) || canvas.height !== Math.round(h * dpr)) {
			canvas.width = Math.round(w * dpr);
			canvas.height = Math.round(h * dpr);
		}
		const f = frameFor(vb, w, h);
		ctx.setTransform(1, 0, 0, 1, 0, 0);
		ctx.clearRect(0, 0, canvas.width, canvas.height);
		// User units → device pixels, y flipped (stencil y up).
		const k = dpr / f.scale;
		ctx.setTransform(k, 0, 0, -k, -f.ox * k, -f.oy * k);
		ctx.fillStyle = colours.pass;
		ctx.fill(shapes.pass);
		const hatch = hatchPattern(ctx, dpr, colours);
		if (typeof hatch !== 'string') hatch.setTransform(ctx.getTransform().inverse());
		ctx.fillStyle = hatch;
		ctx.fill(shapes.fail);
		// Keep the base layers for the next zoom or pan frame, before the highlights.
		const image = this.drawn?.image ?? document.createElement('canvas');
		image.width = canvas.width;
		image.height = canvas.height;
		image.getContext('2d')?.drawImage(canvas, 0, 0);
		this.drawn = { vb: { ...vb }, image };
		this.strokeHighlights(ctx, k, highlights);
		// For the map benchmark and tests: how many full renderings this canvas has shown.
		canvas.dataset.painted = String(Number(canvas.dataset.painted ?? 0) + 1);
		return f;
	}

	/** A zoom or pan frame: the kept rendering moved and scaled. */
	quick(vb: ViewBox): MapTransform | null {
		const { canvas, drawn } = this;
		const ctx = canvas.getContext('2d');
		if (!ctx || !drawn) return null;
		const dpr = dprOf();
		const [w, h] = [canvas.clientWidth, canvas.clientHeight];
		const from = frameFor(drawn.vb, w, h);
		const to = frameFor(vb, w, h);
		const s = from.scale / to.scale;
		ctx.setTransform(1, 0, 0, 1, 0, 0);
		ctx.clearRect(0, 0, canvas.width, canvas.height);
		ctx.setTransform(
			s,
			0,
			0,
			s,
			((from.ox - to.ox) / to.scale) * dpr,
			((from.oy - to.oy) / to.scale) * dpr
		);
		ctx.drawImage(drawn.image, 0, 0);
		return to;
	}

	/** Hover or selection changed, view still: the kept rendering plus the new highlights. */
	highlights(vb: ViewBox, highlights: Highlight[]): boolean {
		const { canvas, drawn } = this;
		const ctx = canvas.getContext('2d');
		if (!ctx || !drawn) return false;
		ctx.setTransform(1, 0, 0, 1, 0, 0);
		ctx.clearRect(0, 0, canvas.width, canvas.height);
		ctx.drawImage(drawn.image, 0, 0);
		const f = frameFor(vb, canvas.clientWidth, canvas.clientHeight);
		const k = dprOf() / f.scale;
		ctx.setTransform(k, 0, 0, -k, -f.ox * k, -f.oy * k);
		this.strokeHighlights(ctx, k, highlights);
		return true;
	}

	private strokeHighlights(ctx: CanvasRenderingContext2D, k: number, list: Highlight[]): void {
		for (const { d, colour, px } of list) {
			if (!d) continue;
			ctx.strokeStyle = colour;
			ctx.lineWidth = (px * dprOf()) / k;
			ctx.stroke(new Path2D(d));
		}
	}
}
