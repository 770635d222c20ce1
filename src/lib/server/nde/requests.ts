/**
 * Requests for examination to the NDE contractor: the selected welds ready for NDE (welded,
 * visually accepted, no result yet at their current repair cycle) and not yet asked for, as
 * one e-mail to the project's contractor address, with drawing, weld number, size, thickness,
 * method and welder. Each weld on it is closed by its result (results.ts), the request once
 * every weld is.
 */
import { and, asc, desc, eq, inArray, isNull } from 'drizzle-orm';
import { db, schema } from '../db';
import * as audit from '../audit';
import * as mail from '../mail';
import { DomainError } from '../errors';
import { REASON_WORDS } from '$lib/nde/sampling';
import { jointHref, jointsInfo } from './joints-info';
import { projectRule } from './forming';

const s = schema.ndeSelections;
const items = schema.ndeRequestItems;

/** The mail server refused the request: nothing is marked as requested (an API 502). */
export class RequestNotSent extends Error {}

function escape(text: string): string {
	return text.replace(/[&<>"']/g, (ch) => `&#${ch.charCodeAt(0)};`);
}

/** The selected welds of the project (of the given lots) that a request would ask for now. */
export function due(projectId: number, lotIds?: readonly number[]) {
	const rows = db
		.select({
			selectionId: s.id,
			jointId: s.jointId,
			method: s.method,
			reason: s.reason,
			level: s.level,
			lotId: s.lotId,
			lot: schema.ndeLots.label,
			tracerOfJointId: s.tracerOfJointId,
			welderId: s.welderId,
			state: schema.joints.state,
			repairCycle: schema.joints.repairCycle
		})
		.from(s)
		.innerJoin(schema.ndeLots, eq(schema.ndeLots.id, s.lotId))
		.innerJoin(schema.joints, eq(schema.joints.id, s.jointId))
		.where(
			and(
				eq(s.projectId, projectId),
				isNull(s.cancelledAt),
				isNull(schema.joints.voidedAt),
				eq(schema.joints.state, 'awaiting_nde'),
				lotIds ? inArray(s.lotId, [...lotIds]) : undefined
			)
		)
		.orderBy(asc(schema.ndeLots.label), asc(s.id))
		.all();
	if (rows.length === 0) return [];
	const asked = new Set(
		db
			.select({ selectionId: items.selectionId, cycle: items.repairCycle })
			.from(items)
			.where(
				inArray(
					items.selectionId,
					rows.map((r) => r.selectionId)
				)
			)
			.all()
			.map((r) => `${r.selectionId}/${r.cycle}`)
	);
	// A result by the method at the current cycle means the weld is examined already.
	const examined = new Set(
		db
			.select({
				jointId: schema.inspections.jointId,
				method: schema.inspections.method,
				cycle: schema.inspections.repairCycle
			})
			.from(schema.inspections)
			.where(
				and(
					inArray(
						schema.inspections.jointId,
						rows.map((r) => r.jointId)
					),
					eq(schema.inspections.stage, 'nde')
				)
			)
			.all()
			.map((r) => `${r.jointId}/${r.method}/${r.cycle}`)
	);
	return rows.filter(
		(r) =>
			!asked.has(`${r.selectionId}/${r.repairCycle}`) &&
			!examined.has(`${r.jointId}/${r.method}/${r.repairCycle}`)
	);
}

/** The request's lines, as the e-mail and the page show them. */
function lines(projectId: number, rows: ReturnType<typeof due>, origin: string) {
	const info = jointsInfo(db, [
		...rows.map((r) => r.jointId),
		...rows.map((r) => r.tracerOfJointId).filter((id): id is number => id != null)
	]);
	const stampOf = new Map(
		db
			.select({ id: schema.welders.id, stamp: schema.welders.stamp })
			.from(schema.welders)
			.where(eq(schema.welders.projectId, projectId))
			.all()
			.map((w) => [w.id, w.stamp])
	);
	return rows.map((r) => {
		const joint = info.get(r.jointId)!;
		const of = r.tracerOfJointId != null ? info.get(r.tracerOfJointId) : undefined;
		const why =
			r.reason === 'tracer'
				? `Tracer of ${of ? `${of.drawing} weld ${of.number}` : 'a reject'}`
				: r.reason === 'full'
					? `100 % of welder ${stampOf.get(r.welderId ?? 0) ?? ''}'s work`
					: REASON_WORDS[r.reason];
		return {
			lot: r.lot,
			drawing: joint.drawing,
			weld: joint.label,
			size: joint.size,
			thickness: joint.thickness,
			method: r.method,
			welders: joint.welders.join(' '),
			why:
				r.repairCycle > 0
					? `${why}; repair ${r.repairCycle}, same method (ASME B31.3 341.3.3)`
					: why,
			url: `${origin}${jointHref(projectId, joint)}`
		};
	});
}

type Line = ReturnType<typeof lines>[number];

function message(
	to: string,
	project: { code: string; name: string },
	from: string,
	note: string,
	requestId: number,
	list: Line[],
	pageUrl: string
): mail.Message {
	const subject = `NDE request ${project.code}-${requestId}: ${list.length} weld${list.length === 1 ? '' : 's'}`;
	const columns = [
		'Lot',
		'Drawing',
		'Weld',
		'Size',
		'Thickness',
		'Method',
		'Welder',
		'Selected as'
	];
	const cells = (line: Line) => [
		line.lot,
		line.drawing,
		line.weld,
		line.size,
		line.thickness,
		line.method,
		line.welders,
		line.why
	];
	const intro = `${from} asks for the examination of the welds below on ${project.code} ${project.name}. Please quote the request number and each drawing and weld number on your reports.`;
	const caution =
		'The extent and the tracers follow the project settings; examination and acceptance rest with qualified personnel under the code, edition and contract in force.';
	const html = `<!doctype html><html><body style="margin:0;background:#f3f1ec;font-family:Arial,Helvetica,sans-serif;color:#1c2126">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0"><tr><td align="center" style="padding:24px 12px">
<table role="presentation" cellpadding="0" cellspacing="0" style="max-width:900px;background:#ffffff;border:1px solid #d8d3c8">
<tr><td style="background:#1f2a33;color:#ffffff;padding:14px 24px;font-size:18px;font-weight:bold;letter-spacing:1px">TACKSHEET</td></tr>
<tr><td style="padding:24px;font-size:15px;line-height:1.5">
<h1 style="font-size:20px;margin:0 0 16px">${escape(subject)}</h1>
<p style="margin:0 0 14px">${escape(intro)}</p>
${note ? `<p style="margin:0 0 14px">Note: ${escape(note)}</p>` : ''}
<table cellpadding="6" cellspacing="0" style="border-collapse:collapse;font-size:13px;width:100%">
<tr>${columns.map((col) => `<th align="left" style="border-bottom:2px solid #1f2a33">${col}</th>`).join('')}</tr>
${list
	.map(
		(line) =>
			`<tr>${cells(line)
				.map((cell, n) =>
					n === 2
						? `<td style="border-bottom:1px solid #d8d3c8"><a href="${escape(line.url)}">${escape(cell)}</a></td>`
						: `<td style="border-bottom:1px solid #d8d3c8">${escape(cell)}</td>`
				)
				.join('')}</tr>`
	)
	.join('\n')}
</table>
<p style="margin:18px 0 0;font-size:13px;color:#5a636b">${escape(caution)}</p>
</td></tr>
<tr><td style="padding:14px 24px;border-top:1px solid #d8d3c8;font-size:12px;color:#5a636b">Sent by Tacksheet, weld quality control, to ${escape(to)}. The lots: ${escape(pageUrl)}</td></tr>
</table></td></tr></table></body></html>`;
	const text = [
		'TACKSHEET',
		'',
		subject,
		'',
		intro,
		'',
		...(note ? [`Note: ${note}`, ''] : []),
		columns.join(' | '),
		...list.map((line) => cells(line).join(' | ')),
		'',
		caution,
		'',
		`Sent by Tacksheet, weld quality control, to ${to}. The lots: ${pageUrl}`
	].join('\n');
	return { to, subject, text, html };
}

/**
 * Send the welds due for NDE (of the given lots, or all) to the project's NDE contractor as
 * one request. Stored first and sent after; a mail server that refuses it leaves nothing
 * marked as requested (502), so the welds are asked for again next time.
 */
export async function send(
	projectId: number,
	input: { lotIds?: number[]; note: string },
	userId: string,
	origin: string
) {
	const rule = projectRule(db, projectId);
	if (!rule.contractorEmail)
		throw new DomainError(
			"The project has no NDE contractor's address yet: an administrator sets it under Settings → NDE lots and extent.",
			409,
			'contractorEmail'
		);
	const rows = due(projectId, input.lotIds);
	if (rows.length === 0)
		throw new DomainError(
			'Nothing to request: no selected weld is waiting for NDE that has not been asked for already.',
			409
		);
	const project = db
		.select({ code: schema.projects.code, name: schema.projects.name })
		.from(schema.projects)
		.where(eq(schema.projects.id, projectId))
		.get()!;
	const who = db
		.select({ name: schema.users.name, email: schema.users.email })
		.from(schema.users)
		.where(eq(schema.users.id, userId))
		.get();
	const list = lines(projectId, rows, origin);
	const request = db.transaction((tx) => {
		const made = tx
			.insert(schema.ndeRequests)
			.values({ projectId, sentTo: rule.contractorEmail, note: input.note, sentBy: userId })
			.returning()
			.get();
		for (const row of rows)
			tx.insert(items)
				.values({ requestId: made.id, selectionId: row.selectionId, repairCycle: row.repairCycle })
				.run();
		audit.record(
			{
				action: 'nde_request',
				entity: 'nde_request',
				entityId: made.id,
				projectId,
				userId,
				after: { sentTo: made.sentTo, selections: rows.map((r) => r.selectionId), note: input.note }
			},
			tx
		);
		return made;
	});
	try {
		await mail.send(
			message(
				rule.contractorEmail,
				project,
				who?.name ?? who?.email ?? 'The QC team',
				input.note,
				request.id,
				list,
				`${origin}/projects/${projectId}/nde`
			)
		);
	} catch (error) {
		db.delete(schema.ndeRequests).where(eq(schema.ndeRequests.id, request.id)).run();
		throw new RequestNotSent(
			`The mail server did not take the request (${error instanceof Error ? error.message : 'no answer'}); nothing was marked as requested. Try again later.`
		);
	}
	return { request, sentTo: rule.contractorEmail, lines: list };
}

/** The project's requests, newest first, with how many welds each asks for and has had answered. */
export function list(projectId: number, limit = 20) {
	const requests = db
		.select()
		.from(schema.ndeRequests)
		.where(eq(schema.ndeRequests.projectId, projectId))
		.orderBy(desc(schema.ndeRequests.sentAt), desc(schema.ndeRequests.id))
		.limit(limit)
		.all();
	if (requests.length === 0) return [];
	const counts = db
		.select({ requestId: items.requestId, inspectionId: items.inspectionId })
		.from(items)
		.where(
			inArray(
				items.requestId,
				requests.map((r) => r.id)
			)
		)
		.all();
	return requests.map((r) => {
		const mine = counts.filter((x) => x.requestId === r.id);
		return {
			...r,
			welds: mine.length,
			answered: mine.filter((x) => x.inspectionId != null).length
		};
	});
}
