import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		// Both folders can be moved (WRENCHROLL_BUILD_DIR, WRENCHROLL_KIT_DIR) so two builds can run side by side.
		adapter: adapter({ out: process.env.WRENCHROLL_BUILD_DIR ?? 'build' }),
		outDir: process.env.WRENCHROLL_KIT_DIR ?? '.svelte-kit'
	}
};

export default config;
