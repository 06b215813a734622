/**
 * Constants of the episode forms that pages show, without Zod: a page imports these, so the browser
 * is not sent the schema library for a list or a limit ("JavaScript budget", DEVELOPERS.md).
 * `./episodes` re-exports them for the server.
 */

/**
 * One segment's script limit; the same number as MAX_SCRIPT_CHARACTERS in src/lib/server/episodes/markdown.ts
 * (repeated here because this file reaches the browser; a unit test keeps the two equal).
 */
export const SCRIPT_CHARACTER_LIMIT = 100_000;

export const ASSIGNABLE_ROLES = ['host', 'camera', 'editor', 'merch'] as const;
export type AssignableRole = (typeof ASSIGNABLE_ROLES)[number];
