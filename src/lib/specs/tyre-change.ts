import { SpecError } from './errors';
import type { TyreSize } from './tyres';

export type TyreChange = {
	from: TyreSize;
	to: TyreSize;
	/** New overall diameter minus old; positive when the new tyre is taller. */
	diameterChangeIn: number;
	diameterChangeMm: number;
	diameterChangePercent: number;
	/** Half the diameter change: how much higher the axle (and everything under it) sits. */
	groundClearanceChangeIn: number;
	groundClearanceChangeMm: number;
	/** New diameter ÷ old: multiply what the speedometer shows by this to get the true speed. */
	speedometerFactor: number;
	/** How far the speedometer reads off true, in percent of the true speed (negative = reads low). */
	speedometerErrorPercent: number;
	/** True road speed when the speedometer shows `indicated` (same unit in and out: mph or km/h). */
	trueSpeedAt: (indicated: number) => number;
	revsPerMileChange: number;
	revsPerKmChange: number;
	widthChangeIn: number;
	widthChangeMm: number;
	sidewallChangeIn: number;
	sidewallChangeMm: number;
	cautions: string[];
};

/** Said with every change of tyre size (common practice). */
export const TYRE_CHANGE_CLEARANCE_CAUTION =
	'Check clearance at full steering lock and full suspension compression, and that the load index meets the vehicle rating.';

/** Cautions for a change of tyre size: speedometer direction (if the diameter changes) and clearance (common practice). */
export function tyreChangeCautions(diameterChangeMm: number): string[] {
	const cautions: string[] = [];
	if (diameterChangeMm > 0) {
		cautions.push(
			'A taller tyre makes the speedometer and odometer read low until they are recalibrated.'
		);
	} else if (diameterChangeMm < 0) {
		cautions.push(
			'A shorter tyre makes the speedometer and odometer read high until they are recalibrated.'
		);
	}
	cautions.push(TYRE_CHANGE_CLEARANCE_CAUTION);
	return cautions;
}

/** True speed = indicated × new diameter ÷ old diameter (handbook arithmetic: same revolutions, longer roll-out). */
export function trueSpeed(indicated: number, speedometerFactor: number): number {
	if (!Number.isFinite(indicated) || indicated < 0) {
		throw new SpecError('The indicated speed must be a number of zero or more.');
	}
	return indicated * speedometerFactor;
}

/**
 * Compares two tyre sizes. Diameter and width are differences of the parsed sizes; ground clearance under
 * the axle changes by half the diameter change (common practice: the axle sits one loaded radius up);
 * the speedometer factor is new diameter ÷ old diameter.
 */
export function compareTyres(oldSize: TyreSize, newSize: TyreSize): TyreChange {
	const diameterChangeIn = newSize.diameterIn - oldSize.diameterIn;
	const diameterChangeMm = newSize.diameterMm - oldSize.diameterMm;
	// Millimetres are the exact stored figure for metric codes; the ratio is the same in either unit.
	const speedometerFactor = newSize.diameterMm / oldSize.diameterMm;
	return {
		from: oldSize,
		to: newSize,
		diameterChangeIn,
		diameterChangeMm,
		diameterChangePercent: (diameterChangeMm / oldSize.diameterMm) * 100,
		groundClearanceChangeIn: diameterChangeIn / 2,
		groundClearanceChangeMm: diameterChangeMm / 2,
		speedometerFactor,
		// Indicated = true ÷ factor, so the reading is off by (1 ÷ factor − 1) of the true speed.
		speedometerErrorPercent: (1 / speedometerFactor - 1) * 100,
		trueSpeedAt: (indicated: number) => trueSpeed(indicated, speedometerFactor),
		revsPerMileChange: newSize.revsPerMile - oldSize.revsPerMile,
		revsPerKmChange: newSize.revsPerKm - oldSize.revsPerKm,
		widthChangeIn: newSize.sectionWidthIn - oldSize.sectionWidthIn,
		widthChangeMm: newSize.sectionWidthMm - oldSize.sectionWidthMm,
		sidewallChangeIn: newSize.sidewallIn - oldSize.sidewallIn,
		sidewallChangeMm: newSize.sidewallMm - oldSize.sidewallMm,
		cautions: tyreChangeCautions(diameterChangeMm)
	};
}
