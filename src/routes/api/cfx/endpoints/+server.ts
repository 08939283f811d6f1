import { json } from '@sveltejs/kit';
import { cfxEndpointSchema } from '$lib/cfx/endpoint-schema';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { listEndpoints, saveEndpoint } from '$lib/server/cfx';

/** Each machine's CFX handle with its line and kind. */
export const GET = apiRoute(() => json({ endpoints: listEndpoints(getDb()) }));

/** Map a handle to a line (201 new, 200 when an existing handle is moved); 422 unknown line. */
export const POST = apiRoute(async ({ request }, actor) => {
	const input = await parseJsonBody(request, cfxEndpointSchema);
	const { endpoint, created } = saveEndpoint(getDb(), input, actor);
	return json(endpoint, { status: created ? 201 : 200 });
});
