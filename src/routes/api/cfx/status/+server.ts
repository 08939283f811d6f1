import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { cfxStatus } from '$lib/server/cfx';

/** The CFX endpoint's connection and counts since the server started (configured false without CFX_URL). */
export const GET = apiRoute(() => json(cfxStatus()));
