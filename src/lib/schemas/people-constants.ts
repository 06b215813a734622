/**
 * Constants of the people and channel forms that pages show, without Zod: a page imports these, so
 * the browser is not sent the schema library for a list or a limit ("JavaScript budget",
 * DEVELOPERS.md). `./people` re-exports them for the server.
 */
import { FRAME_RATES } from '../timecode';

/** The programme frame rates a channel or an episode may use (the list lives in $lib/timecode). */
export const FRAME_RATE_VALUES = FRAME_RATES;

/** Longest disclosure a channel may set (the channel.disclosure check says the same). */
export const DISCLOSURE_MAX = 500;
