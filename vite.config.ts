import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig, type Plugin } from 'vitest/config';
import { createUploadStage } from './server/upload-stage.js';
import { DEFAULT_UPLOADS_DIR, uploadMaxMb } from './server/defaults.js';

/** The same streamed uploads in `vite dev` and `vite preview` as in the production server. */
function uploadStage(): Plugin {
	const stage = () =>
		createUploadStage({
			uploadsDir: process.env.UPLOADS_DIR || DEFAULT_UPLOADS_DIR,
			maxMb: uploadMaxMb()
		});
	return {
		name: 'tacksheet-upload-stage',
		configureServer(server) {
			if (process.env.VITEST) return;
			server.middlewares.use(stage());
		},
		configurePreviewServer(server) {
			server.middlewares.use(stage());
		}
	};
}

export default defineConfig({
	plugins: [tailwindcss(), uploadStage(), sveltekit()],
	test: {
		include: ['src/**/*.test.ts', 'tests/integration/**/*.test.ts'],
		environment: 'node',
		pool: 'forks',
		setupFiles: ['tests/setup-env.ts'],
		testTimeout: 20_000,
		expect: { requireAssertions: true }
	}
});
