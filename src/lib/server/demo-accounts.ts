import type { Role } from '../access';

/**
 * The demo scenario: Fenmoor Works, an invented contract manufacturer with three SMT lines.
 * Every name here is made up. Passwords are printed in the README; change them on a real site.
 */
// No $lib imports: the Playwright tests read this file too.
export const DEMO_USERS: { email: string; name: string; role: Role; password: string }[] = [
	{
		email: 'admin@fenmoor.example',
		name: 'Ada Quarrington',
		role: 'admin',
		password: 'demo-admin-pass'
	},
	{
		email: 'engineer@fenmoor.example',
		name: 'Bram Oakhollow',
		role: 'engineer',
		password: 'demo-engineer-pass'
	},
	{
		email: 'technician@fenmoor.example',
		name: 'Cleo Marrowby',
		role: 'technician',
		password: 'demo-technician-pass'
	},
	{
		email: 'quality@fenmoor.example',
		name: 'Dev Ashcombe',
		role: 'quality',
		password: 'demo-quality-pass'
	},
	{
		email: 'viewer@fenmoor.example',
		name: 'Esme Tarnfield',
		role: 'viewer',
		password: 'demo-viewer-pass'
	}
];
