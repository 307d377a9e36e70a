import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		// npm start, npm test and npm run bench each build into their own folder, so one
		// never replaces the files another's running server is reading.
		adapter: adapter({ out: process.env.BUILD_DIR ?? 'build' }),
		// The origin check lives in hooks.server.ts (src/lib/server/csrf.ts): the same rule,
		// but API calls carrying a Bearer token may post multipart files without an Origin.
		csrf: { trustedOrigins: ['*'] },
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				// Svelte and chart.js set inline style attributes.
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:'],
				'font-src': ['self'],
				'connect-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		}
	}
};

export default config;
