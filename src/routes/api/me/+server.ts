import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';

export const GET = apiRoute((_event, actor) => json(actor));
