import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { chartSummary } from '$lib/server/spc/summary';

/** Every chart with its phase, latest capability and open signals, worst first. */
export const GET = apiRoute(() => json({ charts: chartSummary(getDb()) }));
