import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		// Both folders can be moved (WRENCHROLL_BUILD_DIR, WRENCHROLL_KIT_DIR) so two builds can run side by side.
		adapter: adapter({ out: process.env.WRENCHROLL_BUILD_DIR ?? 'build' }),
		outDir: process.env.WRENCHROLL_KIT_DIR ?? '.svelte-kit',
		// Content-Security-Policy header on every rendered page (OWASP ASVS 4.0.3 V14.4.3). Every
		// page is rendered per request, so inline scripts are allowed by a fresh nonce: SvelteKit adds
		// it to its own start-up script, and src/app.html puts %sveltekit.nonce% on its hand-written one.
		csp: {
			mode: 'nonce',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self'],
				// Svelte writes inline style attributes for computed positions and widths (timeline marks,
				// upload progress). CSP cannot allow an attribute by nonce, so attributes alone get
				// 'unsafe-inline'; <style> elements and stylesheets stay 'self' only, and no script runs
				// from a style attribute.
				'style-src-attr': ['unsafe-inline'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		}
	}
};

export default config;
