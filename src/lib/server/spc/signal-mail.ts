import { and, asc, eq, gte, inArray, like, or } from 'drizzle-orm';
import { digestMail, signalMail } from '$lib/spc';
import type { Db } from '../db';
import { mailOutbox, spcMailQueue, spcSignals, users } from '../db/schema';
import { sendMail } from '../mail';
import { characteristicsByIds, chartDetail } from './chart-service';
import { listFollowers } from './characteristics';

/** A stored signal (signals.ts has the same alias; not imported from there to keep one direction). */
type SignalRow = typeof spcSignals.$inferSelect;

/** Mails about signals to one person within this window before further ones wait for a digest. */
export const DIGEST_WINDOW_MS = 5 * 60 * 1000;
/** Individual signal mails per person per window; more become one digest. */
export const DIGEST_THRESHOLD = 3;

const origin = () => (process.env.ORIGIN ?? '').replace(/\/$/, '');

/** The chart's capability assessment in one line (the same verdict the chart page shows). */
export function assessmentLine(db: Db, chartId: number): string {
	try {
		const a = chartDetail(db, chartId).capability.assessment;
		return `Capability: ${a.headline}. ${a.detail}`;
	} catch (err) {
		console.error('[spc] capability for a signal mail failed', err);
		return 'Capability: see the chart.';
	}
}

function recentSignalMails(db: Db, email: string, since: Date): number {
	return db
		.select({ id: mailOutbox.id })
		.from(mailOutbox)
		.where(
			and(
				or(eq(mailOutbox.kind, 'signal'), eq(mailOutbox.kind, 'signal-digest')),
				gte(mailOutbox.createdAt, since),
				like(mailOutbox.toAddresses, `%${email}%`)
			)
		)
		.all().length;
}

let timer: ReturnType<typeof setTimeout> | null = null;
function scheduleFlush(db: Db): void {
	if (timer) return;
	timer = setTimeout(() => {
		timer = null;
		void flushDigests(db).catch((e) => console.error('[spc] digest mail failed', e));
	}, DIGEST_WINDOW_MS + 1000);
	timer.unref?.();
}

/**
 * Mail the followers of each chart about new signal runs: one mail per chart per evaluation
 * (listing its new runs), or, once a person had DIGEST_THRESHOLD signal mails within
 * DIGEST_WINDOW_MS, the runs wait and go out together as one digest when the window ends.
 * @returns outbox ids of the mails sent now.
 */
export async function notifyFollowers(
	db: Db,
	runStarts: SignalRow[],
	now = new Date()
): Promise<number[]> {
	const sent: number[] = [];
	if (runStarts.length === 0) return sent;
	const byChart = new Map<number, SignalRow[]>();
	for (const s of runStarts)
		byChart.set(s.characteristicId, [...(byChart.get(s.characteristicId) ?? []), s]);
	const chars = new Map(characteristicsByIds(db, [...byChart.keys()]).map((c) => [c.id, c]));
	const since = new Date(now.getTime() - DIGEST_WINDOW_MS);
	for (const [chartId, signals] of byChart) {
		const c = chars.get(chartId);
		const followers = listFollowers(db, chartId);
		const assessment = followers.length ? assessmentLine(db, chartId) : '';
		for (const follower of followers) {
			const queued = db
				.select({ id: spcMailQueue.id })
				.from(spcMailQueue)
				.where(eq(spcMailQueue.userId, follower.userId))
				.get();
			if (queued || recentSignalMails(db, follower.email, since) >= DIGEST_THRESHOLD) {
				for (const s of signals)
					db.insert(spcMailQueue)
						.values({ userId: follower.userId, signalId: s.id, createdAt: now })
						.run();
				scheduleFlush(db);
				continue;
			}
			const { subject, text } = signalMail(origin(), chartId, c, signals, assessment);
			sent.push(await sendMail(db, { to: [follower.email], subject, text, kind: 'signal' }));
		}
	}
	return sent;
}

/**
 * Send one digest per person whose queued signal runs waited at least DIGEST_WINDOW_MS
 * (or all queued ones with `force`). Called on a timer and before each evaluation.
 * @returns outbox ids of the digests sent.
 */
export async function flushDigests(db: Db, now = new Date(), force = false): Promise<number[]> {
	if (!db.select({ id: spcMailQueue.id }).from(spcMailQueue).limit(1).get()) return [];
	const queued = db
		.select({ q: spcMailQueue, s: spcSignals, email: users.email, active: users.active })
		.from(spcMailQueue)
		.innerJoin(spcSignals, eq(spcSignals.id, spcMailQueue.signalId))
		.innerJoin(users, eq(users.id, spcMailQueue.userId))
		.orderBy(asc(spcMailQueue.id))
		.all();
	const byUser = new Map<number, typeof queued>();
	for (const row of queued) byUser.set(row.q.userId, [...(byUser.get(row.q.userId) ?? []), row]);
	const sent: number[] = [];
	for (const [userId, rows] of byUser) {
		const oldest = rows[0].q.createdAt.getTime();
		if (!force && now.getTime() - oldest < DIGEST_WINDOW_MS) continue;
		const ids = rows.map((r) => r.q.id);
		if (rows[0].active) {
			const chars = new Map(
				characteristicsByIds(db, [...new Set(rows.map((r) => r.s.characteristicId))]).map((c) => [
					c.id,
					c
				])
			);
			const byChart = new Map<number, SignalRow[]>();
			for (const r of rows)
				byChart.set(r.s.characteristicId, [...(byChart.get(r.s.characteristicId) ?? []), r.s]);
			const { subject, text } = digestMail(
				origin(),
				[...byChart].map(([chartId, signals]) => ({
					chartId,
					chart: chars.get(chartId),
					signals,
					assessment: assessmentLine(db, chartId)
				}))
			);
			sent.push(
				await sendMail(db, {
					to: [rows[0].email],
					subject,
					text,
					kind: 'signal-digest'
				})
			);
		}
		db.delete(spcMailQueue).where(inArray(spcMailQueue.id, ids)).run();
		void userId;
	}
	return sent;
}
