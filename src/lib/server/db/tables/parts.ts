/** Tables for the parts work. */
// eslint-disable-next-line @typescript-eslint/no-empty-object-type
export interface PartsTables {}
