import { json } from '@sveltejs/kit';
import { apiRoute, readJson } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import {
	addStencilLifeEntry,
	PrintlogRequestError,
	stencilEntryErrors,
	stencilLifeApiView
} from '$lib/server/printlog';
import { fieldErrorsFromZod } from '$lib/schemas/printlog';
import { stencilLifeEntrySchema } from '$lib/schemas/printlog-forms';

/**
 * Add a state change, tension readings (N/cm) or a cleaning / inspection entry to a stencil's
 * life log: 201 `{ entry, stencil, tension }`; 422 `{ errors: [{ field, message }] }`; 404.
 */
export const POST = apiRoute(async ({ params, request }, actor) => {
	const id = Number(params.id);
	let body: unknown;
	try {
		body = await readJson(request);
	} catch {
		return stencilEntryErrors(422, [{ field: '(body)', message: 'must be a JSON object' }]);
	}
	const parsed = stencilLifeEntrySchema.safeParse(body);
	if (!parsed.success) return stencilEntryErrors(422, fieldErrorsFromZod(parsed.error));
	const { at, ...entry } = parsed.data;
	try {
		const stored = addStencilLifeEntry(
			getDb(),
			id,
			{ ...entry, ...(at && { at: new Date(Date.parse(at)) }) },
			actor
		);
		return json({ ...stored, stencil: stencilLifeApiView(stored.stencil) }, { status: 201 });
	} catch (err) {
		if (err instanceof PrintlogRequestError) return stencilEntryErrors(err.status, err.fields);
		throw err;
	}
});
