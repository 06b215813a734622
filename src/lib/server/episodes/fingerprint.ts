/**
 * The fingerprint of an episode's script: SHA-256 over each segment's id and text in rundown order,
 * so any edit, addition, removal or reorder changes it. No app imports, so the demo seed uses it too.
 */
import { createHash } from 'node:crypto';

export function scriptFingerprint(segments: readonly { id: string; body: string }[]): string {
	const hash = createHash('sha256');
	for (const segment of segments) hash.update(`${segment.id}\u0000${segment.body}\u0001`);
	return hash.digest('hex');
}
