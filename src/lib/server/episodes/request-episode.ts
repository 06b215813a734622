/**
 * The episode a request is about, read once per request: the episode layout (its header) and the
 * page under it run their loads side by side and share `locals`, so both take the same promise
 * instead of reading the row twice.
 */
import { episodeDetail, type EpisodeDetail } from './episodes';

const perRequest = new WeakMap<App.Locals, Map<string, Promise<EpisodeDetail>>>();

/** episodeDetail(channelId, episodeId), remembered for the rest of this request; 404 as it does. */
export function requestEpisode(
	locals: App.Locals,
	channelId: string,
	episodeId: string
): Promise<EpisodeDetail> {
	let read = perRequest.get(locals);
	if (!read) perRequest.set(locals, (read = new Map()));
	const key = `${channelId}/${episodeId}`;
	let episode = read.get(key);
	if (!episode) {
		episode = episodeDetail(channelId, episodeId);
		// A 404 is answered by whoever awaits it; this keeps an unawaited copy from being "unhandled".
		episode.catch(() => undefined);
		read.set(key, episode);
	}
	return episode;
}
