import { SpecError } from './errors';
import { MILLIMETRES_PER_INCH } from './units';
import { withGeometry } from './tyre-geometry';

export type TyreSizeKind = 'metric' | 'flotation';
/** P = passenger, LT = light truck, as moulded on the sidewall. */
export type TyreServiceType = 'P' | 'LT';
/** R radial, ZR radial rated for high speed, D diagonal (bias ply), B belted bias. */
export type TyreConstruction = 'R' | 'ZR' | 'D' | 'B';

export type TyreSize = {
	kind: TyreSizeKind;
	/** The size written one way: upper case, no stray spaces, e.g. "LT285/70R17 121/118S", "35x12.50R17". */
	code: string;
	serviceType: TyreServiceType | null;
	construction: TyreConstruction | null;
	sectionWidthMm: number;
	sectionWidthIn: number;
	/** From the code for metric sizes; worked out from the dimensions for flotation sizes. */
	aspectRatio: number;
	rimIn: number;
	sidewallMm: number;
	sidewallIn: number;
	diameterIn: number;
	diameterMm: number;
	circumferenceIn: number;
	circumferenceMm: number;
	/** Geometric (unloaded) figure; makers publish measured, loaded figures that run a little higher. */
	revsPerMile: number;
	revsPerKm: number;
	loadIndex?: number;
	/** Second load index of an LT service description ("121/118"): the rating when fitted as a dual pair. */
	dualLoadIndex?: number;
	speedRating?: string;
	/** "C" after the rim (215/65R16C): commercial, light-truck load construction. */
	commercial: boolean;
	/** "RF" for the construction (245/45RF18): run-flat radial. */
	runFlat: boolean;
	/**
	 * True for flotation sizes: their diameter is the nominal figure the size names, not worked out
	 * from width and aspect ratio, so every screen that shows it says "nominal".
	 */
	diameterNominal: boolean;
};

/** What the parser accepts; outside these it is a typo or not a car or light-truck tyre. */
export const TYRE_LIMITS = {
	sectionWidthMm: { min: 100, max: 500 },
	aspectRatio: { min: 20, max: 100 },
	rimIn: { min: 10, max: 30 },
	// ISO 4000-1 / ETRTO load index table runs from 0 to 279 (from memory).
	loadIndex: { min: 0, max: 279 }
} as const;

/** Said wherever geometric tyre figures are shown. */
export const TYRE_GEOMETRY_NOTE =
	'Worked out from the size code. Makers measure their published figures mounted and under load, so those differ slightly.';

/** Longer than any size with a service description; keeps the parser's work bounded. */
const MAX_CODE_LENGTH = 40;

const EXAMPLES = 'for example 285/70R17, LT285/70R17 121/118S or 35x12.50R17';

// RF is a run-flat radial (245/45RF18); it goes before R so the longer form wins.
const CONSTRUCTION = '(ZR|RF|R|D|B)';
// Speed symbols: A1–A8, then B–Z without I, O and X; "(Y)" is how ratings above 300 km/h are written.
const SPEED_LETTER = '(A[1-8]|[B-HJ-NP-WYZ])';
const SPEED_RATING = '(A[1-8]|[B-HJ-NP-WYZ]|\\(Y\\))';
/**
 * Everything after width/aspect (or diameter×width): construction, rim, LT or C (commercial)
 * suffix, service description plain ("121/118S") or in parentheses ("(102Y)").
 */
const SIZE_TAIL = new RegExp(
	`^(?: ?${CONSTRUCTION} ?| )(\\d+(?:\\.\\d+)?)(?: ?(LT|C))?(?: (?:(\\d{1,3})(?:/(\\d{1,3}))? ?${SPEED_RATING}?|\\((\\d{1,3})(?:/(\\d{1,3}))?${SPEED_LETTER}\\)))?$`
);
/** A bias-ply size in inches, width-rim: 7.50-16, 7.50-16LT, 6.50-16C. */
const BIAS_SIZE = /^(\d+(?:\.\d+)?) ?- ?(\d+(?:\.\d+)?) ?(LT|C)?(?: .*)?$/;
/** The same, up to the rim only: tells "bad rim" apart from "bad text after the rim". */
const SIZE_TAIL_TO_RIM = new RegExp(`^(?: ?${CONSTRUCTION} ?| )(\\d+(?:\\.\\d+)?)(.*)$`);
const NO_RIM_TAIL = new RegExp(`^ ?${CONSTRUCTION}? ?$`);

const METRIC_START = /^(P|LT)? ?\d+ ?\//;
const FLOTATION_START = /^\d+(?:\.\d+)? ?X/;
const FLOTATION_WITH_PREFIX = /^(P|LT) ?\d+(?:\.\d+)? ?X/;
const RIM_WITHOUT_WIDTH = new RegExp(`^(P|LT)? ?${CONSTRUCTION} ?\\d`);
const NUMBER_ONLY = /^(P|LT)? ?\d+(?:\.\d+)?$/;

export type ParsedTail = {
	construction: TyreConstruction | null;
	rimIn: number;
	rimText: string;
	ltSuffix: boolean;
	commercial: boolean;
	runFlat: boolean;
	/** The service description was written in parentheses, as on some high-speed sizes. */
	parenthesised: boolean;
	loadIndex?: number;
	dualLoadIndex?: number;
	speedRating?: string;
};

/** Reads a metric (285/70R17) or flotation (35x12.50R17) tyre size; geometry per handbook arithmetic. */
export function parseTyreSize(text: string): TyreSize {
	if (typeof text !== 'string') {
		throw new SpecError(`Enter the tyre size as text, ${EXAMPLES}.`);
	}
	const cleaned = text.trim().toUpperCase().replace(/\s+/g, ' ').replace(/×/g, 'X');
	if (cleaned === '') {
		throw new SpecError(`The tyre size is empty. Enter one, ${EXAMPLES}.`);
	}
	if (cleaned.length > MAX_CODE_LENGTH) {
		throw new SpecError(`That is too long for a tyre size. Enter just the size, ${EXAMPLES}.`);
	}
	if (BIAS_SIZE.test(cleaned)) refuseBias(cleaned);
	if (FLOTATION_START.test(cleaned)) return parseFlotation(cleaned);
	if (METRIC_START.test(cleaned)) return parseMetric(cleaned);
	if (FLOTATION_WITH_PREFIX.test(cleaned)) {
		throw new SpecError('Flotation sizes put LT at the end, like 37x13.50R20LT.');
	}
	if (RIM_WITHOUT_WIDTH.test(cleaned)) {
		throw new SpecError(
			`"${cleaned}" has a rim size but no width. A metric size starts with the width in millimetres and the aspect ratio, like 285/70R17.`
		);
	}
	if (NUMBER_ONLY.test(cleaned)) {
		throw new SpecError(
			`"${cleaned}" is only part of a tyre size. Write width/aspect ratio and rim, like 285/70R17, or diameter x width and rim, like 35x12.50R17.`
		);
	}
	throw new SpecError(
		`That is not a tyre size Wrenchroll can read. Use the size on the sidewall, ${EXAMPLES}.`
	);
}

/**
 * Bias sizes name the section width in inches and the rim (7.50-16: 7.50 in on a 16 in rim) but
 * not the aspect ratio, so the overall diameter comes from the maker's chart, not the code.
 */
function refuseBias(cleaned: string): never {
	const [, widthText, rimText] = BIAS_SIZE.exec(cleaned)!;
	const widthMm = Number(widthText) * MILLIMETRES_PER_INCH;
	throw new SpecError(
		`${widthText}-${rimText} is a bias-ply size: ${widthText} in (${Number(widthMm.toFixed(1))} mm) wide on a ${Number(rimText)} in rim. The code does not give its overall diameter: diameter from the maker’s chart needed. Enter the maker’s diameter as a flotation size (diameter x width and rim, like 31x7.50R16) or use a text card.`
	);
}

function parseMetric(cleaned: string): TyreSize {
	const head = /^(P|LT)? ?(\d+) ?\/ ?(\d+)(.*)$/.exec(cleaned);
	if (!head) {
		if (new RegExp(`^(P|LT)? ?\\d+ ?/ ?(${CONSTRUCTION} ?\\d|$)`).test(cleaned)) {
			throw new SpecError(
				'The aspect ratio is missing. It goes after the slash, like the 70 in 285/70R17.'
			);
		}
		throw new SpecError(
			'The aspect ratio after the slash must be a whole number, like the 70 in 285/70R17.'
		);
	}
	const [, prefix, widthText, aspectText, rest] = head;
	const tail = parseTail(rest ?? '', `${prefix ?? ''}${widthText}/${aspectText}`, 'metric');
	const serviceType = serviceTypeFrom(prefix, tail.ltSuffix);
	const sectionWidthMm = Number(widthText);
	const aspectRatio = Number(aspectText);

	checkWidthMm(sectionWidthMm, `${sectionWidthMm} mm`);
	if (aspectRatio > TYRE_LIMITS.aspectRatio.max) {
		throw new SpecError(
			`Aspect ratio ${aspectRatio} is over ${TYRE_LIMITS.aspectRatio.max}. It is the sidewall height as a percentage of the width, like the 70 in 285/70R17.`
		);
	}
	if (aspectRatio < TYRE_LIMITS.aspectRatio.min) {
		throw new SpecError(
			`Aspect ratio ${aspectRatio} is under ${TYRE_LIMITS.aspectRatio.min}; no road tyre is that low. Check the number after the slash.`
		);
	}
	checkRim(tail);

	const sidewallMm = (sectionWidthMm * aspectRatio) / 100;
	const diameterMm = tail.rimIn * MILLIMETRES_PER_INCH + 2 * sidewallMm;
	const code =
		`${serviceType ?? ''}${sectionWidthMm}/${aspectRatio}${constructionText(tail)}${tail.rimText}` +
		`${tail.commercial ? 'C' : ''}${serviceDescriptionText(tail)}`;
	return withGeometry({
		kind: 'metric',
		code,
		serviceType,
		construction: tail.construction,
		sectionWidthMm,
		sectionWidthIn: sectionWidthMm / MILLIMETRES_PER_INCH,
		aspectRatio,
		rimIn: tail.rimIn,
		sidewallMm,
		sidewallIn: sidewallMm / MILLIMETRES_PER_INCH,
		diameterMm,
		// Handbook form: rim + 2 × sidewall / 25.4.
		diameterIn: tail.rimIn + (2 * sidewallMm) / MILLIMETRES_PER_INCH,
		tail
	});
}

function parseFlotation(cleaned: string): TyreSize {
	const head = /^(\d+(?:\.\d+)?) ?X ?(\d+(?:\.\d+)?)(.*)$/.exec(cleaned);
	if (!head) {
		throw new SpecError(
			'The width is missing. A flotation size is diameter x width and rim in inches, like 35x12.50R17.'
		);
	}
	const [, diameterText, widthText, rest] = head;
	const diameterIn = Number(diameterText);
	const sectionWidthIn = Number(widthText);
	const tail = parseTail(rest ?? '', `${diameterText}x${widthText}`, 'flotation');
	const serviceType: TyreServiceType | null = tail.ltSuffix ? 'LT' : null;
	if (tail.commercial) {
		throw new SpecError(
			'The C (commercial) suffix belongs to metric sizes like 215/65R16C; flotation sizes put LT at the end, like 37x13.50R20LT.'
		);
	}

	checkWidthMm(sectionWidthIn * MILLIMETRES_PER_INCH, `${sectionWidthIn} in`);
	checkRim(tail);
	if (diameterIn <= tail.rimIn) {
		throw new SpecError(
			`The first number of a flotation size is the overall diameter, and ${diameterIn} in is not larger than the ${tail.rimIn} in rim. Check the numbers, like 35x12.50R17.`
		);
	}
	const sidewallIn = (diameterIn - tail.rimIn) / 2;
	const aspectRatio = (sidewallIn / sectionWidthIn) * 100;
	if (aspectRatio < TYRE_LIMITS.aspectRatio.min) {
		throw new SpecError(
			`A ${diameterIn} in tyre on a ${tail.rimIn} in rim would have a sidewall only ${sidewallIn} in tall for a ${sectionWidthIn} in width; no road tyre is that low. Check the numbers.`
		);
	}
	const code =
		`${diameterIn}x${formatFlotationWidth(sectionWidthIn, widthText ?? '')}` +
		`${constructionText(tail)}${tail.rimText}${tail.ltSuffix ? 'LT' : ''}${serviceDescriptionText(tail)}`;
	return withGeometry({
		kind: 'flotation',
		code,
		serviceType,
		construction: tail.construction,
		sectionWidthMm: sectionWidthIn * MILLIMETRES_PER_INCH,
		sectionWidthIn,
		aspectRatio,
		rimIn: tail.rimIn,
		sidewallMm: sidewallIn * MILLIMETRES_PER_INCH,
		sidewallIn,
		diameterMm: diameterIn * MILLIMETRES_PER_INCH,
		// The first number of a flotation size is the overall diameter in inches.
		diameterIn,
		tail
	});
}

function parseTail(rest: string, sizeSoFar: string, kind: TyreSizeKind): ParsedTail {
	const example = kind === 'metric' ? '285/70R17' : '35x12.50R17';
	if (NO_RIM_TAIL.test(rest)) {
		throw new SpecError(
			`${sizeSoFar} has no rim size. Add the rim diameter in inches after the R, like ${example}.`
		);
	}
	const tail = SIZE_TAIL.exec(rest);
	if (!tail && rest.startsWith('/')) {
		throw new SpecError(`Write the rim after an R, not after a second slash: like ${example}.`);
	}
	if (!tail) {
		const upToRim = SIZE_TAIL_TO_RIM.exec(rest);
		if (upToRim) {
			throw new SpecError(
				`The size reads up to the rim, but "${(upToRim[3] ?? '').trim()}" after it is not a service description. Those look like 121/118S (load index, then speed rating), or leave it off.`
			);
		}
		throw new SpecError(
			`After ${sizeSoFar} comes the construction letter and the rim diameter in inches, like ${example}.`
		);
	}
	const [, construction, rimText, suffix, plainLoad, plainDual, plainSpeed] = tail;
	const [, , , , , , , boxedLoad, boxedDual, boxedSpeed] = tail;
	const parenthesised = boxedLoad !== undefined;
	const loadText = parenthesised ? boxedLoad : plainLoad;
	const dualText = parenthesised ? boxedDual : plainDual;
	const speedRating = parenthesised ? boxedSpeed : plainSpeed;
	const parsed: ParsedTail = {
		construction:
			construction === 'RF' ? 'R' : ((construction as TyreConstruction | undefined) ?? null),
		rimIn: Number(rimText),
		rimText: String(Number(rimText)),
		ltSuffix: suffix === 'LT',
		commercial: suffix === 'C',
		runFlat: construction === 'RF',
		parenthesised
	};
	if (loadText !== undefined) {
		parsed.loadIndex = checkLoadIndex(Number(loadText));
		if (dualText !== undefined) {
			parsed.dualLoadIndex = checkLoadIndex(Number(dualText));
			if (parsed.dualLoadIndex >= parsed.loadIndex) {
				throw new SpecError(
					`In ${loadText}/${dualText} the second load index (fitted as a dual pair) should be lower than the first. Check the order.`
				);
			}
		}
	}
	if (speedRating !== undefined) parsed.speedRating = speedRating;
	return parsed;
}

function checkLoadIndex(loadIndex: number): number {
	if (loadIndex > TYRE_LIMITS.loadIndex.max) {
		throw new SpecError(
			`Load index ${loadIndex} is beyond the load index table (${TYRE_LIMITS.loadIndex.min}–${TYRE_LIMITS.loadIndex.max}). Check the number after the size.`
		);
	}
	return loadIndex;
}

function checkWidthMm(widthMm: number, asTyped: string): void {
	const { min, max } = TYRE_LIMITS.sectionWidthMm;
	if (widthMm < min || widthMm > max) {
		throw new SpecError(
			`A width of ${asTyped} is outside ${min}–${max} mm (about ${(min / MILLIMETRES_PER_INCH).toFixed(1)}–${(max / MILLIMETRES_PER_INCH).toFixed(1)} in), the range of car and light-truck tyres. Check the width.`
		);
	}
}

function checkRim(tail: ParsedTail): void {
	const { min, max } = TYRE_LIMITS.rimIn;
	if (tail.rimIn < min || tail.rimIn > max) {
		throw new SpecError(
			`A ${tail.rimIn} in rim is outside ${min}–${max} in. Check the number after the R.`
		);
	}
	// Road rims come in whole and half inches (16, 16.5, 17 …), common practice.
	if (!Number.isInteger(tail.rimIn * 2)) {
		throw new SpecError(
			`Rim sizes are whole or half inches (16, 16.5, 17 …); ${tail.rimIn} is neither.`
		);
	}
}

function serviceTypeFrom(prefix: string | undefined, ltSuffix: boolean): TyreServiceType | null {
	if (prefix === 'P' && ltSuffix) {
		throw new SpecError(
			'A size cannot be both P (passenger) and LT (light truck). Keep the one on the sidewall.'
		);
	}
	if (prefix === 'LT' || ltSuffix) return 'LT';
	if (prefix === 'P') return 'P';
	return null;
}

function serviceDescriptionText(tail: ParsedTail): string {
	if (tail.loadIndex === undefined) return '';
	const dual = tail.dualLoadIndex === undefined ? '' : `/${tail.dualLoadIndex}`;
	const description = `${tail.loadIndex}${dual}${tail.speedRating ?? ''}`;
	return tail.parenthesised ? ` (${description})` : ` ${description}`;
}

/** The construction letters as written: RF for run-flat, a space when there are none. */
function constructionText(tail: ParsedTail): string {
	if (tail.runFlat) return 'RF';
	return tail.construction ?? ' ';
}

/** Flotation widths are written with two decimals ("12.50", "10.50") when they have a fraction. */
function formatFlotationWidth(widthIn: number, asTyped: string): string {
	if (Number.isInteger(widthIn)) return String(widthIn);
	const decimals = asTyped.split('.')[1]?.replace(/0+$/, '').length ?? 0;
	return decimals <= 2 ? widthIn.toFixed(2) : String(widthIn);
}
