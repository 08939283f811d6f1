import { error, fail, redirect } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { ENGINEERING, hasRole } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import {
	ApertureImportError,
	cachedStencil,
	createRevision,
	deleteAperture,
	DuplicateStencilError,
	findStencil,
	importApertures,
	listImports,
	listRevisions,
	siteTeModelFor,
	warmStencilCache
} from '$lib/server/stencils';
import { teCoverage } from '$lib/stencil/te-prediction';
import {
	apertureFormSchema,
	parseStepRegionsText,
	revisionFormSchema
} from '$lib/schemas/stencil-forms';
import type { ApertureInput, PointUm } from '$lib/stencil';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	const actor = requireActor(locals);
	const db = getDb();
	const id = Number(params.id);
	if (!findStencil(db, id)) error(404, 'No such stencil.');
	const cached = cachedStencil(db, id);
	const check = cached.check;
	const advice = cached.advice();
	return {
		stencil: check.stencil,
		thresholds: check.thresholds,
		summary: check.summary,
		sweep: advice.sweep,
		powder: advice.powder,
		overlaps: advice.overlaps,
		// Streamed: the page and its map do not wait for the site's TE model (a pad scan when the
		// SPI data changed since it was last fitted).
		te: siteTeModelFor(db, check.stencil.technology)
			.then((answer) => ({
				...answer,
				coverage: answer.model
					? teCoverage(
							answer.model,
							check.apertures.map((a) => a.areaRatio)
						)
					: null
			}))
			.catch(() => ({
				model: null,
				reason: 'the site model could not be computed just now',
				coverage: null
			})),
		revisions: listRevisions(db, check.stencil.name),
		imports: listImports(db, id),
		canEdit: hasRole(actor, ENGINEERING),
		revisionForm: await superValidate(
			{
				revision: '',
				thicknessUm: check.stencil.thicknessUm,
				technology: check.stencil.technology,
				ratedLifePrints: check.stencil.ratedLifePrints ?? undefined,
				notes: check.stencil.notes,
				stepRegions: check.stencil.stepRegions
					.map((r) =>
						[
							r.xMinUm / 1000,
							r.yMinUm / 1000,
							r.xMaxUm / 1000,
							r.yMaxUm / 1000,
							r.thicknessUm
						].join(' ')
					)
					.join('\n')
			},
			zod4(revisionFormSchema),
			{ id: 'revision', errors: false }
		),
		apertureForm: await superValidate(zod4(apertureFormSchema), { id: 'aperture' })
	};
};

/** A plain decimal (sign, digits, point, exponent), else NaN: `0x10` or `1_000` are not numbers. */
const strictNumber = (raw: string) =>
	/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(raw) ? Number(raw) : NaN;

/** Parse "x y;x y;…" (µm) into vertices; null when a pair is not two numbers. */
function parseVertices(text: string): PointUm[] | null {
	const pairs = text
		.split(';')
		.map((p) => p.trim())
		.filter(Boolean);
	const out: PointUm[] = [];
	for (const p of pairs) {
		const xy = p.split(/[\s,]+/).map(strictNumber);
		if (xy.length !== 2 || !xy.every(Number.isFinite)) return null;
		out.push([xy[0], xy[1]]);
	}
	return out;
}

const FIELD_OF: Record<string, string> = { verticesUm: 'vertices' };

export const actions = {
	newRevision: async ({ locals, request, params }) => {
		const actor = requireActor(locals, ENGINEERING);
		const form = await superValidate(request, zod4(revisionFormSchema), { id: 'revision' });
		if (!form.valid) return fail(400, { revisionForm: form });
		const steps = parseStepRegionsText(form.data.stepRegions);
		if ('error' in steps) {
			form.errors.stepRegions = [steps.error];
			return fail(400, { revisionForm: form });
		}
		let id: number;
		try {
			id = createRevision(
				getDb(),
				Number(params.id),
				{ ...form.data, stepRegions: steps.regions },
				actor
			).id;
		} catch (err) {
			if (!(err instanceof DuplicateStencilError)) throw err;
			form.errors.revision = [err.message];
			return fail(err.status, { revisionForm: form });
		}
		redirect(303, `/stencils/${id}`);
	},
	addAperture: async ({ locals, request, params }) => {
		const actor = requireActor(locals, ENGINEERING);
		const form = await superValidate(request, zod4(apertureFormSchema), { id: 'aperture' });
		if (!form.valid) return fail(400, { apertureForm: form });
		const d = form.data;
		const aperture: ApertureInput = {
			refdes: d.refdes,
			pad: d.pad,
			shape: d.shape,
			xUm: d.xUm,
			yUm: d.yUm,
			rotationDeg: d.rotationDeg
		};
		if (d.shape === 'circle') aperture.diameterUm = d.diameterUm;
		else if (d.shape === 'polygon') {
			const v = parseVertices(d.vertices);
			if (!v) {
				form.errors.vertices = ['write vertices as "x y; x y; x y" in µm'];
				return fail(400, { apertureForm: form });
			}
			aperture.verticesUm = v;
		} else {
			aperture.lengthUm = d.lengthUm;
			aperture.widthUm = d.widthUm;
			if (d.shape === 'rounded-rectangle') aperture.cornerRadiusUm = d.cornerRadiusUm;
		}
		try {
			importApertures(
				getDb(),
				Number(params.id),
				[aperture],
				{ source: 'form', mode: 'append' },
				actor
			);
		} catch (err) {
			if (!(err instanceof ApertureImportError)) throw err;
			const errors = form.errors as Record<string, string[] | undefined>;
			for (const p of err.problems) {
				const field = FIELD_OF[p.field.replace(/\[.*$/, '')] ?? p.field.replace(/\[.*$/, '');
				errors[field] = [...(errors[field] ?? []), p.message];
			}
			return fail(err.status, { apertureForm: form });
		}
		warmStencilCache(getDb(), Number(params.id));
		return message(form, `Aperture ${d.refdes || '(no refdes)'}.${d.pad} added.`);
	},
	deleteAperture: async ({ locals, request, params }) => {
		const actor = requireActor(locals, ENGINEERING);
		const apertureId = Number((await request.formData()).get('apertureId'));
		if (!Number.isSafeInteger(apertureId)) return fail(400, { rowError: 'No aperture named.' });
		const removed = deleteAperture(getDb(), Number(params.id), apertureId, actor);
		if (removed) warmStencilCache(getDb(), Number(params.id));
		return removed
			? { rowMessage: 'Aperture removed.' }
			: fail(404, { rowError: 'No such aperture.' });
	}
} satisfies Actions;
