/** The words of every message Wrenchroll sends, in one place. */
export function inviteMail(input: {
	channelName: string;
	inviterName: string;
	link: string;
	roles: string[];
}) {
	return {
		subject: `You're invited to the ${input.channelName} crew on Wrenchroll`,
		text: [
			`${input.inviterName} added you to the ${input.channelName} crew on Wrenchroll as ${input.roles.join(', ')}.`,
			'',
			'Set your password and sign in here (the link works once and expires in 7 days):',
			input.link,
			'',
			"If you weren't expecting this, ignore this message."
		].join('\n')
	};
}

export function resetMail(input: { link: string }) {
	return {
		subject: 'Reset your Wrenchroll password',
		text: [
			'Someone asked to reset the password for this address on Wrenchroll.',
			'',
			'Choose a new password here (the link works once and expires in 1 hour):',
			input.link,
			'',
			"If it wasn't you, ignore this message: your password stays as it is."
		].join('\n')
	};
}

export function unlockMail(input: { link: string; minutes: number }) {
	return {
		subject: 'Unlock signing in to Wrenchroll',
		text: [
			'Signing in to Wrenchroll with this address was paused after too many wrong passwords.',
			'',
			`Open this link on the browser you sign in with and press its button (it works once, for ${input.minutes} minutes); then sign in with your password as usual:`,
			input.link,
			'',
			'If you didn\'t ask for it, someone may be guessing your password: ignore this message, and consider choosing a new password through "Forgot your password?".'
		].join('\n')
	};
}
