/** The five crew roles; a person may hold several per channel. Shared by client and server. */
export const ROLES = ['producer', 'host', 'camera', 'editor', 'merch'] as const;
export type Role = (typeof ROLES)[number];

/** Words the crew reads for each role. */
export const ROLE_LABELS: Record<Role, string> = {
	producer: 'Producer',
	host: 'Host',
	camera: 'Camera operator',
	editor: 'Editor',
	merch: 'Merch team'
};
