import { z } from 'zod';
import { ROLES } from '$lib/access';

export const roleSchema = z.enum(ROLES, { error: `role must be one of: ${ROLES.join(', ')}` });

export const newUserSchema = z.object({
	email: z.email({ error: 'Enter a valid e-mail address' }).max(254),
	name: z.string().trim().min(1, { error: 'Name is required' }).max(120),
	role: roleSchema,
	password: z
		.string()
		.min(10, { error: 'Password must be at least 10 characters' })
		.max(200, { error: 'Password must be at most 200 characters' })
});

export const newTokenSchema = z.object({
	name: z.string().trim().min(1, { error: 'Name is required' }).max(80),
	role: roleSchema
});

export const signInSchema = z.object({
	email: z.string().trim().min(1, { error: 'Enter your e-mail' }).max(254),
	password: z.string().min(1, { error: 'Enter your password' }).max(1024)
});
