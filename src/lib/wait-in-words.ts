/** A wait in seconds as a person says it: "a minute", "14 minutes", "an hour". Rounded up: never promise less. */
export function waitInWords(seconds: number): string {
	const minutes = Math.max(1, Math.ceil(seconds / 60));
	if (minutes === 1) return 'a minute';
	if (minutes < 60) return `${minutes} minutes`;
	const hours = Math.ceil(minutes / 60);
	return hours === 1 ? 'an hour' : `${hours} hours`;
}
