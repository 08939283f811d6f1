import type { Db } from '../db';
import { lines, printRuns, products, users } from '../db/schema';

/** A product, two lines and an engineer in a fresh test database. */
export function seedFactory(db: Db) {
	const product = db
		.insert(products)
		.values({ code: 'PB-100', name: 'Pump controller board' })
		.returning()
		.get();
	const line1 = db.insert(lines).values({ code: 'SMT-1', name: 'Line 1' }).returning().get();
	const line2 = db.insert(lines).values({ code: 'SMT-2', name: 'Line 2' }).returning().get();
	const engineer = db
		.insert(users)
		.values({
			email: 'eng@fenmoor.example',
			name: 'Ada Engineer',
			role: 'engineer',
			passwordHash: 'x'
		})
		.returning()
		.get();
	return { product, line1, line2, engineer };
}

/** Closed print runs, one per value, a minute apart from `start`. */
export function addRuns(
	db: Db,
	at: { productId: number; lineId: number; key: string; start: Date },
	values: readonly number[]
): number[] {
	return values.map((v, i) => {
		const startedAt = new Date(at.start.getTime() + i * 60_000);
		return db
			.insert(printRuns)
			.values({
				productId: at.productId,
				lineId: at.lineId,
				parameters: { [at.key]: v },
				startedAt,
				endedAt: new Date(startedAt.getTime() + 30_000),
				boardsPrinted: 1
			})
			.returning({ id: printRuns.id })
			.get().id;
	});
}
