// Without Zod, so the spec-card form's fields can say their limits without loading the schemas.

/** Longest heading and body a text card takes: what fits a lower third at broadcast size. */
export const TEXT_CARD_LIMITS = { heading: 60, body: 280, fastener: 60 } as const;
