/** Tables for the spec-cards work. */
// eslint-disable-next-line @typescript-eslint/no-empty-object-type
export interface SpecCardTables {}
