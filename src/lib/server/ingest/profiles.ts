import type { Actor } from '$lib/access';
import { CANONICAL_PROFILE, type MappingProfile } from '$lib/ingest';
import { mappingProfileSchema } from '$lib/schemas/ingest';
import type { Db } from '../db';
import { actorLabel, recordAudit } from '../audit';
import { ApiError } from '../api';

/** A saved mapping profile. */
export interface SpiProfileRecord {
	id: number;
	name: string;
	machine: string;
	profile: MappingProfile;
	createdAt: Date;
	updatedAt: Date | null;
	createdBy: string;
}

function fromRow(r: Record<string, unknown>): SpiProfileRecord {
	return {
		id: r.id as number,
		name: r.name as string,
		machine: r.machine as string,
		profile: JSON.parse(r.profile as string) as MappingProfile,
		createdAt: new Date(r.created_at as number),
		updatedAt: r.updated_at === null ? null : new Date(r.updated_at as number),
		createdBy: r.created_by as string
	};
}

/** All saved profiles by machine, then name. */
export function listProfiles(db: Db): SpiProfileRecord[] {
	return (
		db.$client.prepare(`select * from spi_profiles order by machine, name`).all() as Record<
			string,
			unknown
		>[]
	).map(fromRow);
}

/** One profile, or undefined. */
export function findProfile(db: Db, id: number): SpiProfileRecord | undefined {
	const r = db.$client.prepare(`select * from spi_profiles where id = ?`).get(id) as
		Record<string, unknown> | undefined;
	return r ? fromRow(r) : undefined;
}

/**
 * The profile an import asks for: none/empty → the canonical layout; a number → that saved
 * profile; else a saved profile by exact name.
 * @throws ApiError 400 naming the unknown profile.
 */
export function resolveImportProfile(
	db: Db,
	ref: string | null | undefined
): { profile: MappingProfile; profileId: number | null } {
	const value = ref?.trim() ?? '';
	if (value === '' || value.toLowerCase() === 'canonical')
		return { profile: CANONICAL_PROFILE, profileId: null };
	const byName = () => {
		const r = db.$client.prepare(`select * from spi_profiles where name = ?`).get(value) as
			Record<string, unknown> | undefined;
		return r ? fromRow(r) : undefined;
	};
	const row = (/^\d+$/.test(value) ? findProfile(db, Number(value)) : undefined) ?? byName();
	if (!row)
		throw new ApiError(400, {
			error: `Unknown mapping profile "${value}": give a saved profile's id or name, or leave it empty for the canonical layout.`
		});
	return { profile: row.profile, profileId: row.id };
}

/**
 * Create (id null) or replace a profile, validated by `mappingProfileSchema`, audited.
 * @throws ZodError for invalid fields; ApiError 409 for a name already used; 404 unknown id.
 */
export function saveProfile(
	db: Db,
	id: number | null,
	input: unknown,
	actor: Actor | null
): SpiProfileRecord {
	const profile = mappingProfileSchema.parse(input);
	return db.transaction((tx) => {
		const clash = db.$client
			.prepare(`select id from spi_profiles where name = ? and (? is null or id != ?)`)
			.get(profile.name, id, id);
		if (clash)
			throw new ApiError(409, { error: `A profile named "${profile.name}" exists already.` });
		let saved: Record<string, unknown>;
		if (id === null) {
			saved = db.$client
				.prepare(
					`insert into spi_profiles (name, machine, profile, created_by) values (?, ?, ?, ?) returning *`
				)
				.get(profile.name, profile.machine, JSON.stringify(profile), actorLabel(actor)) as Record<
				string,
				unknown
			>;
		} else {
			const before = findProfile(db, id);
			if (!before) throw new ApiError(404, { error: `No mapping profile ${id}.` });
			saved = db.$client
				.prepare(
					`update spi_profiles set name = ?, machine = ?, profile = ?, updated_at = ? where id = ? returning *`
				)
				.get(profile.name, profile.machine, JSON.stringify(profile), Date.now(), id) as Record<
				string,
				unknown
			>;
		}
		const record = fromRow(saved);
		recordAudit(tx, actor, {
			action: id === null ? 'spi-profile.create' : 'spi-profile.update',
			entity: 'spi_profile',
			entityId: record.id,
			after: { name: record.name, machine: record.machine, profile: record.profile }
		});
		return record;
	});
}

/**
 * Delete a mapping profile that no import has used (audited). A used profile is kept, so
 * every import still names how it was read; so is the watched folder's profile.
 * @param watchProfile `SPI_WATCH_PROFILE` (an id or a name), when the watched folder is set up.
 * @throws ApiError 404 for an unknown id; 409 when imports used it or the watched folder reads with it.
 */
export function deleteProfile(
	db: Db,
	id: number,
	actor: Actor | null,
	watchProfile: string | null = null
): void {
	db.transaction((tx) => {
		const record = findProfile(db, id);
		if (!record) throw new ApiError(404, { error: `No mapping profile ${id}.` });
		const used = db.$client
			.prepare(`select count(*) as n, min(id) as firstId from spi_imports where profile_id = ?`)
			.get(id) as { n: number; firstId: number | null };
		if (used.n > 0) {
			throw new ApiError(409, {
				error:
					`Profile "${record.name}" was used by ${used.n} import${used.n === 1 ? '' : 's'} ` +
					`(the first is import ${used.firstId}) and is kept so they still show how they were read. ` +
					'Edit it, or save a new profile under another name.'
			});
		}
		const watched = watchProfile?.trim() ?? '';
		if (watched !== '' && (watched === String(id) || watched === record.name)) {
			throw new ApiError(409, {
				error: `Profile "${record.name}" is the watched folder's profile (SPI_WATCH_PROFILE); change that setting first.`
			});
		}
		db.$client.prepare(`delete from spi_profiles where id = ?`).run(id);
		recordAudit(tx, actor, {
			action: 'spi-profile.delete',
			entity: 'spi_profile',
			entityId: id,
			before: { name: record.name, machine: record.machine, profile: record.profile }
		});
	});
}
