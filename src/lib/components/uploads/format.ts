/** Human-readable sizes, speeds and durations for the uploader (decimal units, as disk makers use). */
export function formatBytes(bytes: number): string {
	if (!Number.isFinite(bytes) || bytes < 0) return '—';
	const units = ['B', 'kB', 'MB', 'GB', 'TB'];
	let value = bytes;
	let unit = 0;
	while (value >= 1000 && unit < units.length - 1) {
		value /= 1000;
		unit++;
	}
	return `${value >= 100 || unit === 0 ? Math.round(value) : value.toFixed(1)} ${units[unit]}`;
}

export function formatSpeed(bytesPerSecond: number): string {
	if (!bytesPerSecond) return '—';
	return `${((bytesPerSecond * 8) / 1e6).toFixed(bytesPerSecond * 8 >= 1e8 ? 0 : 1)} Mbit/s`;
}

export function formatEta(seconds: number): string {
	if (!Number.isFinite(seconds) || seconds < 0) return '—';
	const s = Math.ceil(seconds);
	if (s < 60) return `${s} s left`;
	const m = Math.floor(s / 60);
	if (m < 60) return `${m} min ${String(s % 60).padStart(2, '0')} s left`;
	return `${Math.floor(m / 60)} h ${String(m % 60).padStart(2, '0')} min left`;
}
