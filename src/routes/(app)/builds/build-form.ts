/** Reads the build form into what buildSchema takes. */
export function buildFormValues(form: FormData) {
	const text = (name: string) => String(form.get(name) ?? '');
	return {
		name: text('name'),
		year: text('year'),
		vehicleType: text('vehicleType'),
		drivetrain: text('drivetrain'),
		frontSuspension: text('frontSuspension'),
		rearSuspension: text('rearSuspension'),
		frontSpring: text('frontSpring'),
		rearSpring: text('rearSpring'),
		frontLiftIn: text('frontLiftIn') || '0',
		rearLiftIn: text('rearLiftIn') || '0',
		frontLiftMethod: text('frontLiftMethod'),
		rearLiftMethod: text('rearLiftMethod'),
		tyreSize: text('tyreSize'),
		notes: text('notes'),
		...(form.has('version') ? { version: text('version') } : {})
	};
}
export type BuildFormValues = ReturnType<typeof buildFormValues>;
