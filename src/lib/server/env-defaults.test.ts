import { describe, expect, it } from 'vitest';
import { applyServerEnvDefaults, maxUploadBytes } from './env-defaults';

describe('server environment defaults', () => {
	it('lets uploads of MAX_UPLOAD_MB through adapter-node, with headroom', () => {
		const env: NodeJS.ProcessEnv = {};
		applyServerEnvDefaults(env);
		expect(Number(env.BODY_SIZE_LIMIT)).toBe((1024 + 4) * 1024 * 1024);
		expect(env.ORIGIN).toBe('http://localhost:3000');
	});

	it('keeps what the operator set', () => {
		const env: NodeJS.ProcessEnv = {
			BODY_SIZE_LIMIT: '1M',
			ORIGIN: 'https://rollbead.fenmoor.example',
			PORT: '8080'
		};
		applyServerEnvDefaults(env);
		expect(env).toMatchObject({
			BODY_SIZE_LIMIT: '1M',
			ORIGIN: 'https://rollbead.fenmoor.example'
		});
	});

	it.each([
		[{ MAX_UPLOAD_MB: '10' }, 10 * 1024 * 1024],
		[{ MAX_UPLOAD_MB: 'lots' }, 1024 * 1024 * 1024],
		[{ MAX_UPLOAD_MB: '-5' }, 1024 * 1024 * 1024]
	])('MAX_UPLOAD_MB %j gives %d bytes', (env, bytes) => {
		expect(maxUploadBytes(env)).toBe(bytes);
	});
});
