/**
 * How much guessing and mailing the sign-in and reset pages allow (NIST SP 800-63B §5.2.2: limit
 * failed attempts; OWASP ASVS 4.0.3 V2.2.1: anti-automation against brute force and credential
 * stuffing). Counted in fixed windows in the `throttle_counter` table (see throttle.ts). Only
 * failed sign-ins stay counted: a successful one gives its count back, so a crew signing in all
 * day never meets these limits.
 */
export interface Limit {
	/** Attempts allowed in one window. */
	limit: number;
	windowSeconds: number;
}

export const THROTTLE_LIMITS = {
	/** Failed sign-ins for one e-mail address, from anywhere. */
	signInAddress: { limit: 10, windowSeconds: 15 * 60 },
	/** Failed sign-ins from one client (an IPv4 address or an IPv6 /64), for any addresses. */
	signInClient: { limit: 20, windowSeconds: 15 * 60 },
	/** Failed sign-ins from a browser holding an unlock link's grant (it skips the two above). */
	signInUnlocked: { limit: 10, windowSeconds: 15 * 60 },
	/** Reset and unlock mails for one e-mail address. */
	mailAddress: { limit: 3, windowSeconds: 60 * 60 },
	/** Reset and unlock mails asked for by one client. */
	mailClient: { limit: 10, windowSeconds: 60 * 60 }
} as const satisfies Record<string, Limit>;

/** How long a browser may sign in past the limits after its owner opened an unlock link. */
export const UNLOCK_GRANT_MINUTES = 60;
/** How long an unlock link in the mail stays usable. */
export const UNLOCK_LINK_MINUTES = 60;
