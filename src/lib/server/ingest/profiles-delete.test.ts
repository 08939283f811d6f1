import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import type { MappingProfile } from '$lib/ingest';
import { openTestDatabase } from '../testing';
import { ApiError } from '../api';
import { ingestSpiFile } from './ingest-service';
import { deleteProfile, findProfile, saveProfile } from './profiles';

const FIXTURES = 'tests/fixtures/spi';
const x1 = JSON.parse(
	readFileSync(`${FIXTURES}/example-x1.profile.json`, 'utf8')
) as MappingProfile;

async function* once(bytes: Uint8Array) {
	yield bytes;
}

function statusOf(fn: () => void): { status: number; error: string } {
	try {
		fn();
	} catch (e) {
		if (e instanceof ApiError) return { status: e.status, error: String(e.body().error) };
		throw e;
	}
	throw new Error('expected an ApiError');
}

let t: ReturnType<typeof openTestDatabase>;
beforeEach(() => {
	t = openTestDatabase();
});
afterEach(() => t.close());

describe('deleteProfile', { timeout: 60_000 }, () => {
	it('deletes an unused profile and records who did it', () => {
		const saved = saveProfile(t.db, null, x1, null);
		deleteProfile(t.db, saved.id, null);
		expect(findProfile(t.db, saved.id)).toBeUndefined();
		const audit = t.db.$client
			.prepare(`select action, entity_id as entityId from audit_log where action = ?`)
			.all('spi-profile.delete');
		expect(audit).toEqual([{ action: 'spi-profile.delete', entityId: String(saved.id) }]);
	});

	it('404 for an unknown id', () => {
		expect(statusOf(() => deleteProfile(t.db, 4711, null))).toEqual({
			status: 404,
			error: 'No mapping profile 4711.'
		});
	});

	it('409 when an import used the profile; the profile and the import stay', async () => {
		const saved = saveProfile(t.db, null, x1, null);
		const outcome = await ingestSpiFile(t.db, {
			source: 'api',
			fileName: 'x1.csv',
			body: once(readFileSync(`${FIXTURES}/example-x1-semicolon.csv`)),
			profile: saved.profile,
			profileId: saved.id,
			createdBy: 'user:1'
		});
		const answer = statusOf(() => deleteProfile(t.db, saved.id, null));
		expect(answer.status).toBe(409);
		expect(answer.error).toBe(
			`Profile "${x1.name}" was used by 1 import (the first is import ${outcome.id}) and is kept ` +
				'so they still show how they were read. Edit it, or save a new profile under another name.'
		);
		expect(findProfile(t.db, saved.id)?.name).toBe(x1.name);
	});

	it('409 when the watched folder reads with it (by id or by name)', () => {
		const saved = saveProfile(t.db, null, x1, null);
		expect(statusOf(() => deleteProfile(t.db, saved.id, null, String(saved.id))).status).toBe(409);
		expect(statusOf(() => deleteProfile(t.db, saved.id, null, x1.name)).error).toMatch(
			/SPI_WATCH_PROFILE/
		);
		deleteProfile(t.db, saved.id, null, 'another profile');
		expect(findProfile(t.db, saved.id)).toBeUndefined();
	});
});
