import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { traceBoard, type TraceAnswer } from '$lib/server/analysis';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	requireActor(locals);
	const serial = (url.searchParams.get('serial') ?? '').trim().slice(0, 100);
	const t0 = performance.now();
	const trace: TraceAnswer | null = serial === '' ? null : traceBoard(getDb(), serial);
	return { serial, trace, ms: performance.now() - t0 };
};
