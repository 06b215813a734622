/**
 * The spec-card form's side of `./spec-cards`, without Zod: the kinds and their words, the form
 * fields of a card and back, and the live checks once loaded. The spec-cards page imports this, so
 * its first load stays inside the JavaScript budget (DEVELOPERS.md); the checks themselves
 * (`checkSpecCard`, `specCardProblems`, built on the Zod schemas) arrive when the form mounts in the
 * browser, and are already there on the server, which loads `./spec-cards` for the page's actions.
 */
import type { SpecCardInput, SpecCardKind } from '../specs/cards';
import type { checkSpecCard, specCardProblems } from './spec-cards';

export const SPEC_CARD_KINDS = [
	'tyre-change',
	'torque',
	'lift',
	'tyre',
	'text'
] as const satisfies readonly SpecCardKind[];

/** Words the crew reads for each kind of card. */
export const SPEC_CARD_KIND_LABELS: Record<SpecCardKind, string> = {
	tyre: 'Tyre size',
	'tyre-change': 'Tyre change',
	torque: 'Torque',
	lift: 'Lift',
	text: 'Text'
};

/** What each kind is for, shown under the kind picker. */
export const SPEC_CARD_KIND_HINTS: Record<SpecCardKind, string> = {
	tyre: 'One size: diameter, width, sidewall and revolutions, worked out from the code on the sidewall.',
	'tyre-change':
		'Old size to new: diameter change, how much the axle rises, and the true speed on the speedometer.',
	torque: 'A torque figure in both units, with the caution to check the maker’s instructions.',
	lift: 'Front and rear lift, the rake change, and the fitment notes of the trade.',
	text: 'A heading and a short line of your own, for anything the others don’t cover.'
};

/** How long a card stays on screen unless the editor says otherwise: long enough to read six short lines (our own choice). */
export const DEFAULT_ON_SCREEN_SECONDS = 6;
export const ON_SCREEN_SECONDS_LIMITS = { min: 1, max: 60 } as const;

/** The form fields of each kind, by the names the inputs carry (the same as the input's keys). */
export type SpecCardFormValues = Record<string, string>;

/** A number typed in a form: empty stays undefined (so the schema says "enter a number"), commas read as decimal points. */
function typedNumber(text: string | undefined): number | undefined {
	const trimmed = (text ?? '').trim();
	if (trimmed === '') return undefined;
	return Number(trimmed.replace(',', '.'));
}

const typedText = (text: string | undefined) => {
	const trimmed = (text ?? '').trim();
	return trimmed === '' ? undefined : trimmed;
};

/** The card input a form describes (unchecked): the page's live preview and its form actions read forms the same way. */
export function specCardInputFromForm(values: SpecCardFormValues): unknown {
	const kind = values.kind ?? '';
	switch (kind) {
		case 'tyre':
			return { kind, size: values.size ?? '' };
		case 'tyre-change':
			return { kind, from: values.from ?? '', to: values.to ?? '' };
		case 'torque':
			return {
				kind,
				value: typedNumber(values.value),
				unit: values.unit ?? '',
				fastener: typedText(values.fastener)
			};
		case 'lift':
			return {
				kind,
				frontLiftIn: typedNumber(values.frontLiftIn) ?? 0,
				rearLiftIn: typedNumber(values.rearLiftIn) ?? 0,
				frontSuspension: values.frontSuspension ?? '',
				rearSuspension: values.rearSuspension ?? '',
				method: {
					front: typedText(values['method.front']) ?? null,
					rear: typedText(values['method.rear']) ?? null
				}
			};
		case 'text':
			return { kind, heading: values.heading ?? '', body: values.body ?? '' };
		default:
			return { kind };
	}
}

/** The form fields that describe a stored card, for filling the form when the editor changes it. */
export function specCardFormValues(input: SpecCardInput): SpecCardFormValues {
	switch (input.kind) {
		case 'tyre':
			return { kind: input.kind, size: input.size };
		case 'tyre-change':
			return { kind: input.kind, from: input.from, to: input.to };
		case 'torque':
			return {
				kind: input.kind,
				value: String(input.value),
				unit: input.unit,
				fastener: input.fastener ?? ''
			};
		case 'lift': {
			const method =
				typeof input.method === 'string'
					? { front: input.method, rear: input.method }
					: input.method;
			return {
				kind: input.kind,
				frontLiftIn: String(input.frontLiftIn),
				rearLiftIn: String(input.rearLiftIn),
				frontSuspension: input.frontSuspension,
				rearSuspension: input.rearSuspension,
				'method.front': input.frontLiftIn > 0 ? (method.front ?? '') : '',
				'method.rear': input.rearLiftIn > 0 ? (method.rear ?? '') : ''
			};
		}
		case 'text':
			return { kind: input.kind, heading: input.heading, body: input.body };
	}
}

/** The live checks of a card: the same functions the server's actions use. */
export interface SpecCardChecks {
	checkSpecCard: typeof checkSpecCard;
	specCardProblems: typeof specCardProblems;
}

let offered: SpecCardChecks | null = null;

/** Called by `./spec-cards` when it is evaluated. */
export function offerSpecCardChecks(checks: SpecCardChecks): void {
	offered = checks;
}

/** The checks if `./spec-cards` is loaded already (always on the server), else null. */
export function specCardChecks(): SpecCardChecks | null {
	return offered;
}

/** Loads `./spec-cards` (and Zod with it) and answers its checks. */
export async function loadSpecCardChecks(): Promise<SpecCardChecks> {
	await import('./spec-cards');
	if (!offered) throw new Error('The spec-card checks did not load.');
	return offered;
}
