import { SpecError } from './errors';

// Conversion factors from NIST Special Publication 811 (2008 edition), Appendix B.8,
// "Factors for units listed alphabetically". B.8 prints them to seven significant digits;
// the inch is exact by definition (international yard and pound agreement, 1959).

/** NIST SP 811 Appendix B.8: 1 ft·lbf = 1.355818 N·m. */
export const NEWTON_METRES_PER_FOOT_POUND_FORCE = 1.355818;
/** NIST SP 811 Appendix B.8: 1 in·lbf = 0.1129848 N·m. */
export const NEWTON_METRES_PER_INCH_POUND_FORCE = 0.1129848;
/** NIST SP 811 Appendix B.8: 1 lbf = 4.448222 N. */
export const NEWTONS_PER_POUND_FORCE = 4.448222;
/** NIST SP 811 Appendix B.8: 1 in = 25.4 mm exactly. */
export const MILLIMETRES_PER_INCH = 25.4;
/** By definition: 12 in to the foot, so 12 in·lbf to the ft·lbf exactly. */
export const INCHES_PER_FOOT = 12;

/** Where the factors above come from, for a footnote or a tooltip. */
export const UNIT_FACTOR_SOURCE = 'NIST SP 811 (2008), Appendix B.8';

export type TorqueUnit = 'ft·lbf' | 'N·m' | 'in·lbf';
export const TORQUE_UNITS = ['ft·lbf', 'N·m', 'in·lbf'] as const satisfies readonly TorqueUnit[];

export type LengthUnit = 'in' | 'mm';

/** ft·lbf → N·m with the NIST SP 811 B.8 factor. */
export function ftLbfToNm(footPoundsForce: number): number {
	return footPoundsForce * NEWTON_METRES_PER_FOOT_POUND_FORCE;
}

/** N·m → ft·lbf with the NIST SP 811 B.8 factor. */
export function nmToFtLbf(newtonMetres: number): number {
	return newtonMetres / NEWTON_METRES_PER_FOOT_POUND_FORCE;
}

/** in·lbf → N·m with the NIST SP 811 B.8 factor. */
export function inLbfToNm(inchPoundsForce: number): number {
	return inchPoundsForce * NEWTON_METRES_PER_INCH_POUND_FORCE;
}

/** N·m → in·lbf with the NIST SP 811 B.8 factor. */
export function nmToInLbf(newtonMetres: number): number {
	return newtonMetres / NEWTON_METRES_PER_INCH_POUND_FORCE;
}

/** lbf → N with the NIST SP 811 B.8 factor. */
export function lbfToN(poundsForce: number): number {
	return poundsForce * NEWTONS_PER_POUND_FORCE;
}

/** N → lbf with the NIST SP 811 B.8 factor. */
export function nToLbf(newtons: number): number {
	return newtons / NEWTONS_PER_POUND_FORCE;
}

/** in → mm, exact (1 in = 25.4 mm, NIST SP 811 B.8). */
export function inToMm(inches: number): number {
	return inches * MILLIMETRES_PER_INCH;
}

/** mm → in, exact (1 in = 25.4 mm, NIST SP 811 B.8). */
export function mmToIn(millimetres: number): number {
	return millimetres / MILLIMETRES_PER_INCH;
}

/** Torque in any of our units → N·m (NIST SP 811 B.8 factors). */
export function torqueToNm(value: number, unit: TorqueUnit): number {
	switch (unit) {
		case 'N·m':
			return value;
		case 'ft·lbf':
			return ftLbfToNm(value);
		case 'in·lbf':
			return inLbfToNm(value);
	}
}

/**
 * Torque from one unit to another, always from the stated value: ft·lbf ↔ in·lbf
 * uses the exact 12 in per ft instead of going through N·m and two rounded factors.
 */
export function convertTorque(value: number, from: TorqueUnit, to: TorqueUnit): number {
	if (from === to) return value;
	if (from === 'ft·lbf' && to === 'in·lbf') return value * INCHES_PER_FOOT;
	if (from === 'in·lbf' && to === 'ft·lbf') return value / INCHES_PER_FOOT;
	const newtonMetres = torqueToNm(value, from);
	return to === 'ft·lbf'
		? nmToFtLbf(newtonMetres)
		: to === 'in·lbf'
			? nmToInLbf(newtonMetres)
			: newtonMetres;
}

export type FormatOptions = {
	/** Show a leading "+" on positive values (for changes such as "+1.1 in"). */
	signed?: boolean;
};

/**
 * Rounds once, for display only, to `precision` decimals and appends the unit with a space
 * (NIST SP 811 §7.2). Callers pass the exact computed value, never an already rounded one.
 */
export function formatQuantity(
	value: number,
	unit: string,
	precision: number,
	options: FormatOptions = {}
): string {
	return appendUnit(formatNumber(value, precision, options), unit);
}

/** The number part of {@link formatQuantity}: one rounding, no "-0". */
export function formatNumber(
	value: number,
	precision: number,
	options: FormatOptions = {}
): string {
	if (!Number.isFinite(value)) {
		throw new SpecError('That number could not be worked out. Check the values you entered.');
	}
	if (!Number.isInteger(precision) || precision < 0 || precision > 6) {
		throw new SpecError('Display precision must be a whole number of decimals from 0 to 6.');
	}
	let text = value.toFixed(precision);
	// toFixed keeps the sign of tiny negatives ("-0.0"); a change of nothing reads as 0.
	if (/^-0(\.0+)?$/.test(text)) text = text.slice(1);
	if (options.signed && !text.startsWith('-') && Number(text) !== 0) text = `+${text}`;
	return text;
}

function appendUnit(number: string, unit: string): string {
	return unit === '' ? number : `${number} ${unit}`;
}

/** Significant figures of a converted torque: off by at most 0.5 % of the exact value. */
export const TORQUE_SIGNIFICANT_FIGURES = 3;

/**
 * Rounds once to at least `figures` significant figures (never rounding away whole units: 813.49
 * shows as 813, 2.711636 as 2.71, 0.677909 as 0.678), so the shown figure errs by at most half a
 * unit in the last kept place: under 0.5 % at three figures.
 */
export function formatSignificant(value: number, unit: string, figures: number): string {
	if (!Number.isFinite(value) || value === 0) return formatQuantity(value, unit, 0);
	const decimals = Math.max(0, figures - 1 - Math.floor(Math.log10(Math.abs(value))));
	return formatQuantity(value, unit, Math.min(decimals, 6));
}

/** How many decimals a typed number carries (95 → 0, 95.5 → 1), capped at 3 for display. */
export function statedDecimals(value: number): number {
	if (!Number.isFinite(value) || Number.isInteger(value)) return 0;
	const text = String(value);
	if (text.includes('e')) return 3;
	const decimals = text.split('.')[1]?.length ?? 0;
	return Math.min(decimals, 3);
}

/** Shows a value the person typed as they typed it (up to 3 decimals), never re-rounded. */
export function formatStated(value: number, unit: string): string {
	return formatQuantity(value, unit, statedDecimals(value));
}

export type TorqueCardInput = { value: number; unit: TorqueUnit };

export type TorqueCard = {
	stated: TorqueCardInput;
	newtonMetres: number;
	footPoundsForce: number;
	inchPoundsForce: number;
	/** The imperial figure as it reads on screen, e.g. "95 ft·lbf". */
	imperial: string;
	/** The metric figure as it reads on screen, e.g. "129 N·m". */
	metric: string;
};

/** Largest torque we accept; beyond this it is almost certainly a typo (or not a road vehicle). */
export const MAX_TORQUE_NM = 20_000;

/** Under this a converted N·m figure is shown in in·lbf rather than ft·lbf (common practice). */
export const SMALL_FASTENER_FT_LBF = 10;

/**
 * Imperial and metric torque side by side. The stated figure is shown as typed; the other is
 * converted from the exact stated value (NIST SP 811 B.8) and rounded once to three significant
 * figures, the same rule in both directions. N·m input under 10 ft·lbf is shown in in·lbf, the
 * unit the trade states small fasteners in.
 */
export function torqueCard(input: TorqueCardInput): TorqueCard {
	const { value, unit } = input;
	if (!(TORQUE_UNITS as readonly string[]).includes(unit)) {
		throw new SpecError('Torque unit must be ft·lbf, N·m or in·lbf.');
	}
	if (typeof value !== 'number' || !Number.isFinite(value)) {
		throw new SpecError('Enter the torque as a number, for example 95.');
	}
	if (value <= 0) {
		throw new SpecError('Torque must be more than zero.');
	}
	const newtonMetres = torqueToNm(value, unit);
	if (newtonMetres > MAX_TORQUE_NM) {
		throw new SpecError(
			'That torque is far beyond any wheel or suspension fastener. Check the number and the unit.'
		);
	}
	const footPoundsForce = convertTorque(value, unit, 'ft·lbf');
	const inchPoundsForce = convertTorque(value, unit, 'in·lbf');

	let imperial: string;
	let metric: string;
	switch (unit) {
		case 'ft·lbf':
			imperial = formatStated(value, 'ft·lbf');
			metric = formatSignificant(newtonMetres, 'N·m', TORQUE_SIGNIFICANT_FIGURES);
			break;
		case 'in·lbf':
			imperial = formatStated(value, 'in·lbf');
			metric = formatSignificant(newtonMetres, 'N·m', TORQUE_SIGNIFICANT_FIGURES);
			break;
		case 'N·m':
			// The trade states small fasteners (under 10 ft·lbf) in in·lbf.
			imperial =
				footPoundsForce < SMALL_FASTENER_FT_LBF
					? formatSignificant(inchPoundsForce, 'in·lbf', TORQUE_SIGNIFICANT_FIGURES)
					: formatSignificant(footPoundsForce, 'ft·lbf', TORQUE_SIGNIFICANT_FIGURES);
			metric = formatStated(value, 'N·m');
			break;
	}
	return {
		stated: { value, unit },
		newtonMetres,
		footPoundsForce,
		inchPoundsForce,
		imperial,
		metric
	};
}
