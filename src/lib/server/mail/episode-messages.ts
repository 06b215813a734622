/** The words of the messages episode work sends: stage arrivals, assignments and script reviews. */

export function stageArrivalMail(input: {
	personName: string;
	episodeTitle: string;
	stageLabel: string;
	direction: 'forward' | 'back' | 'created';
	moverName: string;
	stageWork: string;
	note: string;
	link: string;
}) {
	const first = input.personName.split(' ')[0];
	const what =
		input.direction === 'back'
			? `${input.moverName} moved “${input.episodeTitle}” back to ${input.stageLabel}.`
			: `“${input.episodeTitle}” has reached ${input.stageLabel}, moved on by ${input.moverName}.`;
	return {
		subject:
			input.direction === 'back'
				? `Back to ${input.stageLabel}: ${input.episodeTitle}`
				: `${input.stageLabel} is yours: ${input.episodeTitle}`,
		text: [
			`Hi ${first},`,
			'',
			what,
			`At this stage: ${input.stageWork}.`,
			...(input.note ? ['', `Note from ${input.moverName}:`, input.note] : []),
			'',
			'Open the episode:',
			input.link
		].join('\n')
	};
}

export function assignmentMail(input: {
	personName: string;
	assignerName: string;
	role: string;
	episodeTitle: string;
	link: string;
}) {
	return {
		subject: `You're the ${input.role.toLowerCase()} on “${input.episodeTitle}”`,
		text: [
			`Hi ${input.personName.split(' ')[0]},`,
			'',
			`${input.assignerName} assigned you as ${input.role.toLowerCase()} on “${input.episodeTitle}”.`,
			'',
			'Open the episode:',
			input.link
		].join('\n')
	};
}

export function scriptSubmittedMail(input: {
	producerName: string;
	hostName: string;
	episodeTitle: string;
	link: string;
}) {
	return {
		subject: `Script ready for approval: ${input.episodeTitle}`,
		text: [
			`Hi ${input.producerName.split(' ')[0]},`,
			'',
			`${input.hostName} sent the script of “${input.episodeTitle}” for your approval.`,
			'',
			'Read it, then approve it or return it with comments:',
			input.link
		].join('\n')
	};
}

export function scriptReviewedMail(input: {
	hostName: string;
	producerName: string;
	episodeTitle: string;
	approved: boolean;
	comment: string;
	link: string;
}) {
	return {
		subject: input.approved
			? `Script approved: ${input.episodeTitle}`
			: `Script returned with comments: ${input.episodeTitle}`,
		text: [
			`Hi ${input.hostName.split(' ')[0]},`,
			'',
			input.approved
				? `${input.producerName} approved the script of “${input.episodeTitle}”.`
				: `${input.producerName} returned the script of “${input.episodeTitle}” with comments.`,
			...(input.comment ? ['', input.comment] : []),
			'',
			input.link
		].join('\n')
	};
}
