import { z } from 'zod';

// Zod compiles object parsers with `new Function` where it may, and probes for that when the first
// schema is built. The page's Content-Security-Policy allows no eval (svelte.config.js), so the probe
// would be refused and reported as a violation on every page with a form: tell Zod not to try. This
// module is evaluated before any page's code, so before any schema exists.
z.config({ jitless: true });
