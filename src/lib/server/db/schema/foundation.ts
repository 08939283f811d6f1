import { sql } from 'drizzle-orm';
import { index, integer, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';

/** Timestamps are stored as Unix epoch milliseconds (integer), always UTC. */
const createdAt = () =>
	integer('created_at', { mode: 'timestamp_ms' })
		.notNull()
		.default(sql`(unixepoch('subsec') * 1000)`);

// Relative import: drizzle-kit loads this file outside Vite, where `$lib` does not resolve.
import { ROLES } from '../../../access';

export const sites = sqliteTable('sites', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	code: text('code').notNull().unique(),
	name: text('name').notNull(),
	timeZone: text('time_zone').notNull().default('UTC'),
	createdAt: createdAt()
});

export const lines = sqliteTable('lines', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	siteId: integer('site_id').references(() => sites.id),
	code: text('code').notNull().unique(),
	name: text('name').notNull(),
	active: integer('active', { mode: 'boolean' }).notNull().default(true),
	createdAt: createdAt()
});

export const products = sqliteTable('products', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	code: text('code').notNull().unique(),
	name: text('name').notNull(),
	active: integer('active', { mode: 'boolean' }).notNull().default(true),
	createdAt: createdAt()
});

export const users = sqliteTable('users', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	email: text('email').notNull().unique(),
	name: text('name').notNull(),
	role: text('role', { enum: ROLES }).notNull(),
	passwordHash: text('password_hash').notNull(),
	active: integer('active', { mode: 'boolean' }).notNull().default(true),
	createdAt: createdAt(),
	updatedAt: integer('updated_at', { mode: 'timestamp_ms' })
});

export const apiTokens = sqliteTable('api_tokens', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	name: text('name').notNull(),
	/** SHA-256 of the token; the token itself is shown once and never stored. */
	tokenHash: text('token_hash').notNull().unique(),
	/** First characters of the token, to recognise it in lists. */
	prefix: text('prefix').notNull(),
	role: text('role', { enum: ROLES }).notNull(),
	createdByUserId: integer('created_by_user_id').references(() => users.id),
	createdAt: createdAt(),
	lastUsedAt: integer('last_used_at', { mode: 'timestamp_ms' }),
	revokedAt: integer('revoked_at', { mode: 'timestamp_ms' }),
	/** After this the token is refused; chosen when it is made (default 90 days). */
	expiresAt: integer('expires_at', { mode: 'timestamp_ms' })
});

/**
 * Signed-in sessions the server can end: the session cookie carries a random id whose SHA-256 is
 * kept here; deleting the row signs that browser out at once (sign-out, password change,
 * deactivation, role change, "sign out everywhere"). Idle and absolute timeouts are checked
 * against lastSeenAt and createdAt on every request.
 */
export const sessions = sqliteTable(
	'sessions',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		idHash: text('id_hash').notNull().unique(),
		userId: integer('user_id')
			.notNull()
			.references(() => users.id),
		createdAt: createdAt(),
		lastSeenAt: integer('last_seen_at', { mode: 'timestamp_ms' }).notNull()
	},
	(t) => [index('sessions_user_idx').on(t.userId)]
);

/** Password-reset links: single use, short-lived; only the SHA-256 of the link's token is kept. */
export const passwordResets = sqliteTable(
	'password_resets',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		tokenHash: text('token_hash').notNull().unique(),
		userId: integer('user_id')
			.notNull()
			.references(() => users.id),
		createdAt: createdAt(),
		expiresAt: integer('expires_at', { mode: 'timestamp_ms' }).notNull(),
		usedAt: integer('used_at', { mode: 'timestamp_ms' })
	},
	(t) => [index('password_resets_user_idx').on(t.userId, t.createdAt)]
);

export const auditLog = sqliteTable(
	'audit_log',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		at: createdAt(),
		/** Who acted: "user:12", "token:3" or "system". */
		actor: text('actor').notNull(),
		userId: integer('user_id').references(() => users.id),
		action: text('action').notNull(),
		entity: text('entity').notNull(),
		entityId: text('entity_id'),
		before: text('before', { mode: 'json' }),
		after: text('after', { mode: 'json' })
	},
	(t) => [index('audit_entity_idx').on(t.entity, t.entityId), index('audit_at_idx').on(t.at)]
);

export const mailOutbox = sqliteTable(
	'mail_outbox',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		createdAt: createdAt(),
		toAddresses: text('to_addresses').notNull(),
		subject: text('subject').notNull(),
		textBody: text('text_body').notNull(),
		/** What the mail is about, e.g. "signal" or "signal-digest", for filtering. */
		kind: text('kind').notNull().default('general'),
		/** stored: kept locally (no SMTP configured); sent: accepted by SMTP; failed: SMTP refused. */
		status: text('status', { enum: ['stored', 'sent', 'failed'] }).notNull(),
		sentAt: integer('sent_at', { mode: 'timestamp_ms' }),
		error: text('error')
	},
	(t) => [index('mail_created_idx').on(t.createdAt)]
);

export const signInFailures = sqliteTable(
	'sign_in_failures',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		email: text('email').notNull(),
		ip: text('ip').notNull(),
		at: integer('at', { mode: 'timestamp_ms' }).notNull()
	},
	(t) => [index('sign_in_failures_key_idx').on(t.email, t.ip, t.at)]
);

/** Site-editable settings (thresholds, cause lists …) as JSON values under a key. */
export const settings = sqliteTable(
	'settings',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		siteId: integer('site_id').references(() => sites.id),
		key: text('key').notNull(),
		value: text('value', { mode: 'json' }).notNull(),
		updatedAt: integer('updated_at', { mode: 'timestamp_ms' })
	},
	(t) => [uniqueIndex('settings_site_key_idx').on(t.siteId, t.key)]
);
