import { z } from 'zod';
import { ROLES } from '$lib/access';

export const roleSchema = z.enum(ROLES, { error: `role must be one of: ${ROLES.join(', ')}` });

export const newUserSchema = z.object({
	email: z.email({ error: 'Enter a valid e-mail address' }).max(254),
	name: z.string().trim().min(1, { error: 'Name is required' }).max(120),
	// Least privilege: a new person starts as a viewer; an administrator picks anything higher.
	role: roleSchema.default('viewer'),
	password: z
		.string()
		.min(10, { error: 'Password must be at least 10 characters' })
		.max(200, { error: 'Password must be at most 200 characters' })
});

export const newTokenSchema = z.object({
	name: z.string().trim().min(1, { error: 'Name is required' }).max(80),
	role: roleSchema.default('viewer'),
	expiresInDays: z
		.number({ error: 'Days must be a whole number' })
		.int({ error: 'Days must be a whole number' })
		.min(1, { error: 'At least 1 day' })
		.max(730, { error: 'At most 730 days (two years)' })
		.default(90)
});

export const newPasswordSchema = z
	.string()
	.min(10, { error: 'Password must be at least 10 characters' })
	.max(200, { error: 'Password must be at most 200 characters' });

export const changePasswordSchema = z
	.object({
		currentPassword: z.string().min(1, { error: 'Enter your current password' }).max(1024),
		newPassword: newPasswordSchema,
		confirmPassword: z.string().max(200)
	})
	.refine((v) => v.newPassword === v.confirmPassword, {
		error: 'The two new passwords differ',
		path: ['confirmPassword']
	});

export const resetRequestSchema = z.object({
	email: z.email({ error: 'Enter a valid e-mail address' }).max(254)
});

export const resetPasswordSchema = z
	.object({
		token: z.string().regex(/^[A-Za-z0-9_-]{43}$/, { error: 'This link is not valid.' }),
		newPassword: newPasswordSchema,
		confirmPassword: z.string().max(200)
	})
	.refine((v) => v.newPassword === v.confirmPassword, {
		error: 'The two new passwords differ',
		path: ['confirmPassword']
	});

export const signInSchema = z.object({
	email: z.string().trim().min(1, { error: 'Enter your e-mail' }).max(254),
	password: z.string().min(1, { error: 'Enter your password' }).max(1024)
});
