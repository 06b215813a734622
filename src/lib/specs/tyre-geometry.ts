/**
 * A tyre size's rolling figures (circumference, revolutions per mile and per km) from its parsed
 * dimensions: handbook arithmetic, kept apart from the reading of the size code in tyres.ts.
 */
import type { ParsedTail, TyreSize } from './tyres';

/** Inches in a mile: 5280 ft × 12 in. */
const INCHES_PER_MILE = 63_360;
/** Millimetres in a kilometre. */
const MILLIMETRES_PER_KILOMETRE = 1_000_000;

/** A parsed size before its circumference and revolutions are worked out; the tail carries load index and speed rating. */
export type SizeWithoutGeometry = Omit<
	TyreSize,
	| 'circumferenceIn'
	| 'circumferenceMm'
	| 'revsPerMile'
	| 'revsPerKm'
	| 'loadIndex'
	| 'dualLoadIndex'
	| 'speedRating'
	| 'commercial'
	| 'runFlat'
	| 'diameterNominal'
> & {
	tail: ParsedTail;
};

/** Circumference = π × diameter; revolutions per mile = 63,360 / circumference in inches; per km = 10⁶ / circumference in mm. */
export function withGeometry(size: SizeWithoutGeometry): TyreSize {
	const { diameterIn } = size;
	const circumferenceIn = Math.PI * diameterIn;
	const circumferenceMm = Math.PI * size.diameterMm;
	const result: TyreSize = {
		kind: size.kind,
		code: size.code,
		serviceType: size.serviceType,
		construction: size.construction,
		sectionWidthMm: size.sectionWidthMm,
		sectionWidthIn: size.sectionWidthIn,
		aspectRatio: size.aspectRatio,
		rimIn: size.rimIn,
		sidewallMm: size.sidewallMm,
		sidewallIn: size.sidewallIn,
		diameterIn,
		diameterMm: size.diameterMm,
		circumferenceIn,
		circumferenceMm,
		revsPerMile: INCHES_PER_MILE / circumferenceIn,
		revsPerKm: MILLIMETRES_PER_KILOMETRE / circumferenceMm,
		commercial: size.tail.commercial,
		runFlat: size.tail.runFlat,
		diameterNominal: size.kind === 'flotation'
	};
	if (size.tail.loadIndex !== undefined) result.loadIndex = size.tail.loadIndex;
	if (size.tail.dualLoadIndex !== undefined) result.dualLoadIndex = size.tail.dualLoadIndex;
	if (size.tail.speedRating !== undefined) result.speedRating = size.tail.speedRating;
	return result;
}
