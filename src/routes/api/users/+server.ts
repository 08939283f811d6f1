import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { listUsers } from '$lib/server/users';

export const GET = apiRoute(() => json({ users: listUsers(getDb()) }));
