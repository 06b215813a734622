import { fail } from '@sveltejs/kit';
import { forgotSchema } from '$lib/schemas/people';
import { fieldIssues } from '$lib/server/http/api';
import { requestPasswordReset } from '$lib/server/channel/crew';
import type { Actions } from './$types';

export const actions = {
	default: async ({ request, url }) => {
		const form = await request.formData();
		const values = { email: String(form.get('email') ?? '') };
		const parsed = forgotSchema.safeParse(values);
		if (!parsed.success) return fail(400, { errors: fieldIssues(parsed.error), values });
		await requestPasswordReset(parsed.data.email, url.origin);
		return { sent: true, values };
	}
} satisfies Actions;
