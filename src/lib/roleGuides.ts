/** What each role does in Wrenchroll, in the crew's words: shown on the bench until work is assigned. */
import type { Role } from './roles';

export const ROLE_GUIDES: Record<Role, { lead: string; steps: string[] }> = {
	producer: {
		lead: 'You schedule, assign and approve.',
		steps: [
			'Invite the crew and give each person their roles',
			'Set the channel’s frame rate, call to action and contact',
			'Approve scripts and move episodes through their stages'
		]
	},
	host: {
		lead: 'You draft the script segment by segment and present it.',
		steps: [
			'Write each segment in plain words',
			'Watch the spoken time against the target runtime',
			'Send the script for the producer’s approval'
		]
	},
	camera: {
		lead: 'You plan the shots, film at the shop and upload the footage.',
		steps: [
			'Plan the shot list for every segment that needs footage',
			'Log takes with their source timecode',
			'Upload the rushes; uploads resume after a dropped connection'
		]
	},
	editor: {
		lead: 'You cut the episode, mark chapters and add spec cards.',
		steps: [
			'Set the cut length and mark chapters on the timeline',
			'Place cautions and spec cards where they appear on screen',
			'Export chapters for the description and the player'
		]
	},
	merch: {
		lead: 'You link every part shown on screen to the store.',
		steps: [
			'Keep the parts catalogue current',
			'Link parts to the moments they appear',
			'Check the pull list before each shoot day'
		]
	}
};
