/** Nearest-rank percentile (the value at rank ⌈p·n⌉ of the sorted samples), as every bench reports it. */
export function percentile(samples: number[], fraction: number): number {
	const sorted = [...samples].sort((a, b) => a - b);
	return sorted[Math.max(0, Math.ceil(fraction * sorted.length) - 1)];
}
