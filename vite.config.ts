import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	test: {
		include: ['src/**/*.test.ts', 'tests/integration/**/*.test.ts'],
		environment: 'node',
		pool: 'forks',
		setupFiles: ['tests/setup-env.ts'],
		testTimeout: 20_000,
		expect: { requireAssertions: true }
	}
});
