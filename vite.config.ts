import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { loadEnv } from 'vite';
import { defineConfig } from 'vitest/config';

// Server modules read process.env (so scripts and tests share them): fill it from .env
// in development without overriding what the shell set.
for (const [k, v] of Object.entries(loadEnv('development', process.cwd(), ''))) process.env[k] ??= v;

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	server: { host: '127.0.0.1' },
	test: {
		projects: [
			{
				extends: './vite.config.ts',
				test: {
					name: 'unit',
					environment: 'node',
					include: ['src/**/*.spec.ts'],
					testTimeout: 60_000
				}
			},
			{
				extends: './vite.config.ts',
				test: {
					name: 'integration',
					environment: 'node',
					include: ['tests/integration/**/*.spec.ts'],
					fileParallelism: false,
					testTimeout: 60_000,
					hookTimeout: 60_000
				}
			},
			{
				// Stops and restarts the test database under the running app: runs alone, last.
				extends: './vite.config.ts',
				test: {
					name: 'faults',
					environment: 'node',
					include: ['tests/faults/**/*.spec.ts'],
					fileParallelism: false,
					testTimeout: 300_000,
					hookTimeout: 60_000
				}
			}
		]
	}
});
