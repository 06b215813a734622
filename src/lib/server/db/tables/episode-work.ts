/** Tables for episode work (rundown segments, scripts, stage history, cautions, follow-ups). */
// eslint-disable-next-line @typescript-eslint/no-empty-object-type
export interface EpisodeWorkTables {}
