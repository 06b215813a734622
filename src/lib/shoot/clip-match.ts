/**
 * Which uploaded clips a logged take is in, by name: a camera writes the clip name it shows on its
 * screen (the one the camera operator logs) as the file name, with an extension after it (common
 * practice). Pure module, no I/O.
 */

/** The file name without its last extension, as Node's `path.parse(name).name` reads it: "ACAM_1001.mp4" → "ACAM_1001". */
export function fileStem(fileName: string): string {
	const dot = fileName.lastIndexOf('.');
	return dot > 0 ? fileName.slice(0, dot) : fileName;
}

/**
 * The clips whose file name without extension, or whose clip name, is the take's clip name,
 * ignoring case and surrounding spaces; none for a blank clip name.
 */
export function clipsMatchingTake<Clip extends { fileName: string; clipName: string }>(
	takeClipName: string,
	clips: readonly Clip[]
): Clip[] {
	const wanted = takeClipName.trim().toLowerCase();
	if (!wanted) return [];
	return clips.filter(
		(clip) =>
			fileStem(clip.fileName).trim().toLowerCase() === wanted ||
			clip.clipName.trim().toLowerCase() === wanted
	);
}
