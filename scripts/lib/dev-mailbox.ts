/**
 * What the demo start command runs for mail. Without SMTP_URL it starts the loopback fake mail
 * server; the dev mailbox that shows its mail (with live invite and reset links) is turned on with
 * DEV_MAILBOX=1 only for the local demo: when the server listens on loopback, unless DEV_MAILBOX
 * says otherwise. Serving the network (HOST=0.0.0.0 or a LAN address) leaves it off unless
 * DEV_MAILBOX=1 is set by hand.
 */
export interface MailSetting {
	SMTP_URL?: string;
	DEV_MAILBOX?: string;
	HOST?: string;
}

const loopbackHost = (host: string) =>
	host === 'localhost' || host === '::1' || /^127\.\d+\.\d+\.\d+$/.test(host);

export function demoMailbox(env: MailSetting): { fakeMail: boolean; mailbox: boolean } {
	const fakeMail = !env.SMTP_URL;
	if (!fakeMail) return { fakeMail, mailbox: false };
	if (env.DEV_MAILBOX !== undefined && env.DEV_MAILBOX !== '')
		return { fakeMail, mailbox: env.DEV_MAILBOX === '1' };
	return { fakeMail, mailbox: loopbackHost(env.HOST ?? '127.0.0.1') };
}
