/** Tables for the edit (chapters and the timeline). */
// eslint-disable-next-line @typescript-eslint/no-empty-object-type
export interface EditTables {}
