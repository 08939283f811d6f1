import { and, eq } from 'drizzle-orm';
import type { Actor } from '$lib/access';
import { Refusal, type FieldProblem } from '$lib/errors';
import type { Db } from '../db';
import { lines, products, spcCharacteristics, spcFollowers, users } from '../db/schema';
import { recordAudit } from '../audit';
import { getCharacteristic, type CharacteristicSummary } from './chart-service';
import {
	characteristicInputSchema,
	characteristicValues,
	checkCharacteristic,
	type CharacteristicInput,
	type InputProblem
} from '$lib/spc/characteristic-input';
import { CHARTABLE_PARAMETERS } from '$lib/spc/chart-measures';

/** Invalid characteristic input: the problems by field (HTTP 422 / form errors). */
export class CharacteristicInputError extends Refusal {
	readonly status = 422;
	constructor(readonly problems: InputProblem[]) {
		super(problems.map((p) => `${p.field}: ${p.message}`).join('; '));
	}

	override get fieldProblems(): FieldProblem[] {
		return this.problems;
	}
}

function validate(db: Db, raw: unknown): CharacteristicInput {
	const parsed = characteristicInputSchema.safeParse(raw);
	if (!parsed.success) {
		throw new CharacteristicInputError(
			parsed.error.issues.map((i) => ({
				field: i.path.map(String).join('.') || 'body',
				message: i.message
			}))
		);
	}
	const input = parsed.data;
	const problems = checkCharacteristic(input, CHARTABLE_PARAMETERS);
	if (
		!db.select({ id: products.id }).from(products).where(eq(products.id, input.productId)).get()
	) {
		problems.push({ field: 'productId', message: `no product with id ${input.productId}` });
	}
	const known = new Set(
		db
			.select({ id: lines.id })
			.from(lines)
			.all()
			.map((l) => l.id)
	);
	const unknown = input.lineIds.filter((id) => !known.has(id));
	if (unknown.length)
		problems.push({ field: 'lineIds', message: `no line with id ${unknown.join(', ')}` });
	if (problems.length) throw new CharacteristicInputError(problems);
	return input;
}

/**
 * Create a characteristic (audited); unset specs take the measure's defaults.
 * @throws CharacteristicInputError with the problems by field.
 */
export function createCharacteristic(
	db: Db,
	raw: unknown,
	actor: Actor | null
): CharacteristicSummary {
	const input = validate(db, raw);
	const id = db.transaction((tx) => {
		const row = tx
			.insert(spcCharacteristics)
			.values({
				...characteristicValues(input),
				createdByUserId: actor?.kind === 'user' ? actor.id : null
			})
			.returning()
			.get();
		recordAudit(tx, actor, {
			action: 'create',
			entity: 'spc-characteristic',
			entityId: row.id,
			after: { ...row }
		});
		return row.id;
	});
	return getCharacteristic(db, id);
}

/**
 * Replace a characteristic's settings (audited with before and after). Frozen limits stay; if
 * the chart type changes the chart falls back to Phase I until new limits are frozen.
 * @throws CharacteristicInputError, or NotFoundError for an unknown id.
 */
export function updateCharacteristic(
	db: Db,
	id: number,
	raw: unknown,
	actor: Actor | null
): CharacteristicSummary {
	const before = getCharacteristic(db, id);
	const input = validate(db, raw);
	db.transaction((tx) => {
		const row = tx
			.update(spcCharacteristics)
			.set(characteristicValues(input))
			.where(eq(spcCharacteristics.id, id))
			.returning()
			.get();
		recordAudit(tx, actor, {
			action: 'update',
			entity: 'spc-characteristic',
			entityId: id,
			before: { ...before },
			after: { ...row }
		});
	});
	return getCharacteristic(db, id);
}

/** Follow or stop following a chart's signal mail (people only; tokens have no mailbox). */
export function setFollowing(
	db: Db,
	characteristicId: number,
	userId: number,
	follow: boolean
): void {
	getCharacteristic(db, characteristicId);
	if (follow) {
		db.insert(spcFollowers).values({ characteristicId, userId }).onConflictDoNothing().run();
	} else {
		db.delete(spcFollowers)
			.where(
				and(eq(spcFollowers.characteristicId, characteristicId), eq(spcFollowers.userId, userId))
			)
			.run();
	}
}

/** The followers of a chart with their e-mail addresses (active people only). */
export function listFollowers(db: Db, characteristicId: number) {
	return db
		.select({ userId: users.id, name: users.name, email: users.email })
		.from(spcFollowers)
		.innerJoin(users, eq(users.id, spcFollowers.userId))
		.where(and(eq(spcFollowers.characteristicId, characteristicId), eq(users.active, true)))
		.all();
}
