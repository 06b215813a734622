/** What the core demo seed hands to the per-area seeds: ids by readable key. */
import type { FrameRate } from '../../src/lib/timecode.ts';

export interface SeedContext {
	/** channel key ('torquehaven', 'dunewagon') → channel id */
	channels: Map<string, string>;
	/** e-mail → person id */
	people: Map<string, string>;
	/** build key ('mule', 'tallboy', 'sandpiper') → build id */
	builds: Map<string, string>;
	/** episode slug → { id, channelId, frameRate, stage } */
	episodes: Map<string, { id: string; channelId: string; frameRate: FrameRate; stage: string }>;
}
