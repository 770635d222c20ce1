import { defineConfig, devices } from '@playwright/test';

const port = Number(process.env.E2E_PORT || 4173);
const baseURL = `http://localhost:${port}`;
/** Per port, so two runs on one machine (E2E_PORT) keep apart. */
const dataDir = `test-results/e2e-${port}`;

export default defineConfig({
	testDir: 'tests/e2e',
	outputDir: `test-results/output-${port}`,
	testMatch: '**/*.e2e.ts',
	// Two cores: one worker, tests in order.
	workers: 1,
	fullyParallel: false,
	retries: process.env.CI ? 1 : 0,
	timeout: 60_000,
	// Two cores, often shared: a sign-in (scrypt at OWASP's cost) or a sheet's first render can
	// take several seconds under load, so a web-first assertion waits up to 15 s before it fails.
	expect: { timeout: 15_000 },
	reporter: process.env.CI ? [['list']] : [['list'], ['html', { open: 'never' }]],
	use: {
		baseURL,
		trace: 'retain-on-failure',
		screenshot: 'only-on-failure',
		launchOptions: { executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium' }
	},
	projects: [
		{
			name: 'desktop',
			use: { ...devices['Desktop Chrome'] },
			testIgnore: '**/*.tablet.e2e.ts'
		},
		{
			name: 'tablet',
			use: { viewport: { width: 1024, height: 768 }, hasTouch: true, isMobile: false },
			testMatch: '**/*.tablet.e2e.ts'
		}
	],
	webServer: {
		command: 'node scripts/e2e-server.js',
		url: `${baseURL}/api/health`,
		reuseExistingServer: false,
		// The first run builds the app (a few minutes on a busy two-core machine), then seeds.
		timeout: 600_000,
		stdout: 'ignore',
		gracefulShutdown: { signal: 'SIGTERM', timeout: 5000 },
		env: {
			PORT: String(port),
			ORIGIN: baseURL,
			DATABASE_URL: `${dataDir}/tacksheet.db`,
			UPLOADS_DIR: `${dataDir}/uploads`,
			AUTH_SECRET: 'e2e-secret-not-for-production-0123456789abcdef',
			TACKSHEET_DEMO: '1',
			// Small enough that the over-limit test stays quick.
			UPLOAD_MAX_MB: '25',
			// Photos: small, so the over-limit photo test stays quick.
			PHOTO_MAX_MB: '2'
		}
	}
});
