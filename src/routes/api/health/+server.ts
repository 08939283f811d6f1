import { json } from '@sveltejs/kit';
import { publicApiRoute } from '$lib/server/api';

export const GET = publicApiRoute(() => json({ status: 'ok' }));
