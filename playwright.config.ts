import { defineConfig } from '@playwright/test';

// Browser tests drive Debian's chromium (never a downloaded browser) against the built
// server that npm test starts (APP_URL).
export default defineConfig({
	testDir: 'tests/e2e',
	timeout: 60_000,
	workers: 1,
	retries: 0,
	use: {
		baseURL: process.env.APP_URL ?? 'http://127.0.0.1:3100',
		viewport: { width: 1280, height: 900 },
		launchOptions: {
			executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
			args: [
				'--no-sandbox',
				'--disable-gpu',
				'--disable-quic',
				'--no-first-run',
				'--disable-background-networking',
				'--disable-component-update',
				'--disable-sync'
			]
		}
	}
});
