/**
 * The role matrix shared by the access tests: every route case is called as each role and signed
 * out, and must answer 2xx/3xx when allowed, 403 when not, 401 (API, actions) or 303 to sign-in
 * (pages) when signed out (OWASP ASVS 4.0 V4: access control on the server, deny by default).
 */
import { describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn } from './http';

export type Who = 'producer' | 'host' | 'camera' | 'editor' | 'merch' | 'signed-out';
export const everyone: Who[] = ['producer', 'host', 'camera', 'editor', 'merch'];

export interface Case {
	name: string;
	allowed: Who[];
	call: (visitor: Visitor, who: Who) => Promise<number>;
}

/** Posts a form action the way use:enhance does and answers its status (303 for a redirect). */
export async function actionStatus(
	v: Visitor,
	path: string,
	form: Record<string, string | string[]>
): Promise<number> {
	const response = await v.request(path, {
		method: 'POST',
		form,
		headers: { accept: 'application/json', 'x-sveltekit-action': 'true' }
	});
	if (response.status !== 200) return response.status; // 401 from the guard
	const result = await response.json();
	return result.type === 'redirect' ? 303 : result.status;
}

/** One signed-in visitor per demo role, and one signed out. */
export async function visitorsByRole(): Promise<Map<Who, Visitor>> {
	const visitors = new Map<Who, Visitor>();
	for (const role of everyone) visitors.set(role, await signedIn(demo[role as keyof typeof demo]));
	visitors.set('signed-out', new Visitor());
	return visitors;
}

/** Declares one test per route case and caller. Page cases are named "page …". */
export function describeRoleMatrix(cases: Case[], visitors: Map<Who, Visitor>): void {
	describe.each(cases)('$name', (routeCase) => {
		test.each([...everyone, 'signed-out' as const])('as %s', async (who) => {
			const status = await routeCase.call(visitors.get(who)!, who);
			const isPage = routeCase.name.startsWith('page');
			if (who === 'signed-out') expect(status).toBe(isPage ? 303 : 401);
			else if (routeCase.allowed.includes(who)) {
				expect(status).toBeGreaterThanOrEqual(200);
				expect(status).toBeLessThan(400);
			} else expect(status).toBe(403);
		});
	});
}
