/**
 * Tacksheet's e-mails: plain, branded with the name in type (no images, so they read the same
 * with images blocked), each with an HTML and a text part.
 */
import type { Message } from './mail';
import { plural } from '$lib/words';

function escape(text: string): string {
	return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

function layout(
	to: string,
	subject: string,
	paragraphs: string[],
	action?: { label: string; url: string }
): Message {
	const html = `<!doctype html><html><body style="margin:0;background:#f3f1ec;font-family:Arial,Helvetica,sans-serif;color:#1c2126">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0"><tr><td align="center" style="padding:24px 12px">
<table role="presentation" width="560" cellpadding="0" cellspacing="0" style="max-width:560px;background:#ffffff;border:1px solid #d8d3c8">
<tr><td style="background:#1f2a33;color:#ffffff;padding:14px 24px;font-size:18px;font-weight:bold;letter-spacing:1px">TACKSHEET</td></tr>
<tr><td style="padding:24px;font-size:16px;line-height:1.5">
<h1 style="font-size:20px;margin:0 0 16px">${escape(subject)}</h1>
${paragraphs.map((p) => `<p style="margin:0 0 14px">${escape(p)}</p>`).join('\n')}
${
	action
		? `<p style="margin:22px 0"><a href="${escape(action.url)}" style="background:#2c5b7a;color:#ffffff;padding:12px 20px;text-decoration:none;font-weight:bold;display:inline-block">${escape(action.label)}</a></p>
<p style="margin:0 0 14px;font-size:13px;color:#5a636b">Or paste this address into your browser:<br><span style="word-break:break-all">${escape(action.url)}</span></p>`
		: ''
}
</td></tr>
<tr><td style="padding:14px 24px;border-top:1px solid #d8d3c8;font-size:12px;color:#5a636b">Sent by Tacksheet, weld quality control, to ${escape(to)}.</td></tr>
</table></td></tr></table></body></html>`;
	const text = [
		'TACKSHEET',
		'',
		subject,
		'',
		...paragraphs.flatMap((p) => [p, '']),
		...(action ? [`${action.label}:`, action.url, ''] : []),
		`Sent by Tacksheet, weld quality control, to ${to}.`
	].join('\n');
	return { to, subject, text, html };
}

export type LinkPurpose = 'sign-in' | 'invite' | 'reset';

/** Who invited a person, to which project and in which role, as the invitation says it. */
export interface InvitationFacts {
	invitedBy: string | null;
	project: string | null;
	role: string | null;
}

/** "30 minutes", "72 hours", "1 hour". */
function lifetime(minutes: number): string {
	if (minutes % 60 !== 0) return plural(minutes, 'minute');
	return plural(minutes / 60, 'hour');
}

export function signInLink(
	to: string,
	url: string,
	purpose: LinkPurpose,
	{ minutes, invitation }: { minutes: number; invitation?: InvitationFacts }
): Message {
	const expiry = `The link works once and for ${lifetime(minutes)}.`;
	if (purpose === 'invite') {
		const who = invitation?.invitedBy ?? 'An administrator';
		const where = invitation?.project
			? ` on ${invitation.project}${invitation.role ? `, as ${invitation.role}` : ''}`
			: '';
		return layout(
			to,
			invitation?.project
				? `You are invited to ${invitation.project} on Tacksheet`
				: 'You are invited to Tacksheet',
			[
				`${who} has given you an account on Tacksheet${where}. Tacksheet keeps the weld map, inspection records and weld log of the project.`,
				`Use the button below to sign in for the first time; Tacksheet then asks you to choose a password. ${expiry}`
			],
			{ label: 'Sign in to Tacksheet', url }
		);
	}
	if (purpose === 'reset') {
		return layout(
			to,
			'Your Tacksheet password was reset',
			[
				'An administrator has reset your password. Sign in with the link below and choose a new one under "Your account".',
				expiry
			],
			{ label: 'Sign in and choose a password', url }
		);
	}
	return layout(
		to,
		'Your sign-in link',
		[
			'Someone, hopefully you, asked for a link to sign in to Tacksheet with this address.',
			`${expiry} If you did not ask for it, you can ignore this message.`
		],
		{ label: 'Sign in to Tacksheet', url }
	);
}

/** The hold point called by the foreman: one message per batch to each project inspector. */
export function inspectionRequest(
	to: string,
	request: {
		project: string;
		stage: string;
		requestedBy: string;
		note: string;
		welds: { label: string; drawingNumber: string; url: string }[];
		boardUrl: string;
	}
): Message {
	const count = request.welds.length;
	const subject = `${request.stage[0].toUpperCase()}${request.stage.slice(1)} inspection requested: ${count} weld${count === 1 ? '' : 's'}`;
	return layout(
		to,
		subject,
		[
			`${request.requestedBy} asks for a ${request.stage} inspection on ${request.project}. The work waits at this hold point until the result is recorded.`,
			...(request.note ? [`Note: ${request.note}`] : []),
			...request.welds.map((w) => `Weld ${w.label}, drawing ${w.drawingNumber}: ${w.url}`),
			'Each request closes itself when the inspection is recorded on the joint card.'
		],
		{ label: 'Open the outstanding board', url: request.boardUrl }
	);
}

/** The turnover set someone started is ready to download. */
export function turnoverReady(
	to: string,
	set: {
		projectCode: string;
		scope: string;
		pageUrl: string;
		fileUrl: string;
		bytes: number;
		/** Report lines of revisions that could not be included. */
		leftOut: string[];
		/** Days the zip is kept (EXPORT_KEEP_DAYS); 0 keeps it until a person removes it. */
		keepDays: number;
	}
): Message {
	const megabytes = (set.bytes / 1024 / 1024).toFixed(1);
	return layout(
		to,
		`Turnover set ready: ${set.projectCode}`,
		[
			`The turnover set you started for ${set.projectCode} (${set.scope}) is complete: ${megabytes} MB, with the marked-up set, the weld log, the inspection records and a manifest.`,
			...(set.leftOut.length > 0
				? [
						`${set.leftOut.length} revision${set.leftOut.length === 1 ? ' was' : 's were'} left out:`,
						...set.leftOut
					]
				: []),
			`The download asks you to sign in.${set.keepDays > 0 ? ` The zip is kept for ${set.keepDays} day${set.keepDays === 1 ? '' : 's'}; its record stays after that.` : ''} Past exports are listed at ${set.pageUrl}.`
		],
		{ label: 'Download the turnover set', url: set.fileUrl }
	);
}
