/** The Storage view's query: a keyset cursor from the previous page and a page size. */
import { z } from 'zod';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export const storageQuerySchema = z.object({
	after: z
		.string()
		.max(80, 'That “more” link is not one this page made. Open Storage again from the menu.')
		.transform((value, context) => {
			const [bytes, id] = value.split('_');
			if (!/^\d{1,18}$/.test(bytes ?? '') || !UUID.test(id ?? '')) {
				context.addIssue({
					code: 'custom',
					message: 'That “more” link is not one this page made. Open Storage again from the menu.'
				});
				return z.NEVER;
			}
			return { totalBytes: Number(bytes), id: id!.toLowerCase() };
		})
		.optional(),
	limit: z.coerce
		.number({ error: 'Give the number of episodes per page as a whole number.' })
		.int('Give the number of episodes per page as a whole number.')
		.min(1, 'Ask for at least 1 episode per page.')
		.max(200, 'At most 200 episodes per page.')
		.optional()
});
