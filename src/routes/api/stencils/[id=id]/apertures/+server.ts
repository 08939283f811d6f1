import { json } from '@sveltejs/kit';
import { ApiError, apiRoute, readJson } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import {
	cachedStencil,
	warmStencilCache,
	getStencil,
	importAperturesStaged,
	parseApertureUploadOffThread,
	stencilLimitsFromEnv,
	type ImportMode,
	type UploadResult
} from '$lib/server/stencils';
import type { Actor } from '$lib/access';
import { formatCount, type StencilLimits } from '$lib/stencil/limits';
import { aperturesPayloadSchema, formatIssuePath } from '$lib/schemas/stencil';

/**
 * Every aperture with its figures (unrounded): `{ "apertures": [...] }`, or with
 * `?layout=columns` one array per field plus the map's status paths (the stencil page's form,
 * a fraction of the size). Both are kept per stencil revision (see `cachedStencil`).
 */
export const GET = apiRoute(async ({ params, url }) => {
	const id = Number(params.id);
	const layout = url.searchParams.get('layout');
	if (layout !== null && layout !== 'rows' && layout !== 'columns')
		throw new ApiError(400, {
			error: 'The request has invalid fields.',
			fields: [
				{
					field: 'layout',
					message: `must be "rows" or "columns" (got ${JSON.stringify(layout.slice(0, 40))})`
				}
			]
		});
	const cached = cachedStencil(getDb(), id);
	const body = layout === 'columns' ? cached.columnsJson() : cached.rowsJson();
	return new Response(body, { headers: { 'content-type': 'application/json' } });
});

function modeOf(value: unknown): ImportMode {
	if (value === undefined || value === null || value === '' || value === 'append') return 'append';
	if (value === 'replace') return 'replace';
	throw new ApiError(400, {
		error: 'The request has invalid fields.',
		fields: [
			{ field: 'mode', message: `must be "append" or "replace" (got ${JSON.stringify(value)})` }
		]
	});
}

/** A plain decimal (no exponent, no hex) or NaN, so `centroidRadiusUm=0x10` is refused. */
const strictNumber = (raw: string) => (/^[+-]?(\d+\.?\d*|\.\d+)$/.test(raw) ? Number(raw) : NaN);

const textField = (form: FormData, name: string) => {
	const v = form.get(name);
	return typeof v === 'string' && v.trim() !== '' ? v.trim() : null;
};

/**
 * Count a JSON aperture list before it is validated (validation costs per vertex): more
 * apertures or polygon vertices than the budgets allow is refused with 413 at once.
 */
function refuseOversizedList(body: unknown, limits: StencilLimits): void {
	const list = (body as { apertures?: unknown } | null)?.apertures;
	if (!Array.isArray(list)) return; // the schema words what is wrong
	const tooMany = (what: string, count: number, limit: number, per: string) =>
		new ApiError(413, {
			error: `The request holds ${formatCount(count)} ${what}; the limit is ${formatCount(limit)} ${per}.`,
			fields: [
				{
					field: 'apertures',
					message: `${formatCount(count)} ${what}; the limit is ${formatCount(limit)} ${per}`
				}
			]
		});
	if (list.length > limits.maxAperturesPerStencil)
		throw tooMany('apertures', list.length, limits.maxAperturesPerStencil, 'per import');
	let vertices = 0;
	for (const a of list) {
		const v = (a as { verticesUm?: unknown } | null)?.verticesUm;
		if (Array.isArray(v)) vertices += v.length;
	}
	if (vertices > limits.maxVerticesPerImport)
		throw tooMany('polygon vertices', vertices, limits.maxVerticesPerImport, 'per import');
}

/** Store a parsed file upload (CSV or Gerber) all or nothing: 201 with the summary, or its errors. */
async function importUploadedFile(
	db: ReturnType<typeof getDb>,
	stencilId: number,
	parsed: UploadResult,
	options: { mode: ImportMode; fileName: string | null },
	actor: Actor,
	limits: StencilLimits
): Promise<Response> {
	if (!parsed.ok) throw new ApiError(parsed.status, { error: parsed.error, errors: parsed.errors });
	const summary = await importAperturesStaged(
		db,
		stencilId,
		parsed.apertures,
		{
			source: parsed.format,
			mode: options.mode,
			fileName: options.fileName,
			unit: parsed.unit,
			warnings: parsed.warnings
		},
		actor,
		limits
	);
	warmStencilCache(db, stencilId);
	return json(summary, { status: 201 });
}

/**
 * Import apertures: JSON `{ "apertures": [...], "mode"? }` or multipart `file` (our CSV layout or
 * a Gerber paste layer) with `unit` (CSV), `mode`, optional `centroids` file, `centroidUnit`,
 * `centroidRadiusUm`, `format`; or the file itself as a raw body (text/csv, text/plain,
 * application/octet-stream) with `?unit=&format=&mode=&fileName=`. All or nothing; 201 with the
 * import summary.
 */
export const POST = apiRoute(async ({ params, request, url }, actor) => {
	const id = Number(params.id);
	const db = getDb();
	getStencil(db, id); // 404 before the body is read
	const type = request.headers.get('content-type') ?? '';
	if (type.includes('multipart/form-data')) {
		let form: FormData;
		try {
			form = await request.formData();
		} catch {
			throw new ApiError(400, { error: 'The multipart body could not be read.' });
		}
		const file = form.get('file');
		if (!(file instanceof File) || file.size === 0)
			throw new ApiError(400, {
				error: 'The request has invalid fields.',
				fields: [{ field: 'file', message: 'a non-empty CSV or Gerber file is required' }]
			});
		const mode = modeOf(form.get('mode'));
		const centroids = form.get('centroids');
		const radius = textField(form, 'centroidRadiusUm');
		// Parsing runs on a parser thread with a deadline and a heap ceiling (see parse-thread.ts).
		const limits = stencilLimitsFromEnv();
		const parsed = await parseApertureUploadOffThread(
			{
				fileName: file.name,
				text: await file.text(),
				byteLength: file.size,
				format: textField(form, 'format'),
				unit: textField(form, 'unit'),
				centroids:
					centroids instanceof File && centroids.size > 0
						? { fileName: centroids.name, text: await centroids.text(), byteLength: centroids.size }
						: null,
				centroidUnit: textField(form, 'centroidUnit'),
				centroidRadiusUm: radius === null ? null : strictNumber(radius)
			},
			limits
		);
		return importUploadedFile(db, id, parsed, { mode, fileName: file.name }, actor, limits);
	}
	if (type !== '' && !type.includes('json')) {
		// A raw file body (text/csv, text/plain, application/octet-stream, application/vnd.gerber):
		// what scripts send most easily; options come in the query string.
		const q = url.searchParams;
		const mode = modeOf(q.get('mode'));
		const text = await request.text();
		const limits = stencilLimitsFromEnv();
		const parsed = await parseApertureUploadOffThread(
			{
				fileName: q.get('fileName') ?? 'upload',
				text,
				byteLength: Buffer.byteLength(text),
				format: q.get('format'),
				unit: q.get('unit')
			},
			limits
		);
		return importUploadedFile(db, id, parsed, { mode, fileName: q.get('fileName') }, actor, limits);
	}
	const body = await readJson(request);
	const mode = modeOf((body as { mode?: unknown } | null)?.mode);
	refuseOversizedList(body, stencilLimitsFromEnv());
	const result = aperturesPayloadSchema.safeParse(body);
	if (!result.success)
		throw new ApiError(400, {
			error: 'The request has invalid fields.',
			fields: result.error.issues.slice(0, 100).map((i) => ({
				field: formatIssuePath(i.path) || '(body)',
				message: i.message
			}))
		});
	const summary = await importAperturesStaged(
		db,
		id,
		result.data.apertures,
		{ source: 'json', mode },
		actor
	);
	warmStencilCache(db, id);
	return json(summary, { status: 201 });
});
