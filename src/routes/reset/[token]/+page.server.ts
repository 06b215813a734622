import { loadLink, setPasswordAction } from '$lib/server/auth/password-link';
import type { Actions, PageServerLoad } from './$types';

export const load = (({ params }) => loadLink(params.token, 'reset')) satisfies PageServerLoad;

export const actions = { default: (event) => setPasswordAction(event, 'reset') } satisfies Actions;
