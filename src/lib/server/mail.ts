/**
 * Outgoing mail, always over SMTP through nodemailer. With no SMTP_URL the app starts a
 * local stand-in SMTP server on a loopback port that keeps every message it receives in the
 * database, so sign-in links and notices work on a laptop exactly as in production and an
 * administrator can read them on the mail page.
 */
import type { Readable } from 'node:stream';
import nodemailer, { type Transporter } from 'nodemailer';
import type SMTPTransport from 'nodemailer/lib/smtp-transport';
import { SMTPServer } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import { desc, eq, count } from 'drizzle-orm';
import { db, schema } from './db';
import { config } from './config';

interface MailState {
	standInPort?: number;
	standIn?: SMTPServer;
	starting?: Promise<number>;
	transport?: Transporter;
}

const state = ((globalThis as { tacksheetMail?: MailState }).tacksheetMail ??= {});

function addresses(field: AddressObject | AddressObject[] | undefined): string {
	const list = Array.isArray(field) ? field : field ? [field] : [];
	return list
		.flatMap((a) => a.value.map((v) => v.address ?? ''))
		.filter(Boolean)
		.join(', ');
}

/** Store a message the stand-in received, so the mail page can show it. */
async function keepMessage(stream: Readable, callback: (error?: Error | null) => void) {
	try {
		const parsed = await simpleParser(stream);
		db.insert(schema.mailMessages)
			.values({
				from: addresses(parsed.from),
				to: addresses(parsed.to),
				subject: parsed.subject ?? '(no subject)',
				text: parsed.text ?? '',
				html: typeof parsed.html === 'string' ? parsed.html : null,
				messageId: parsed.messageId ?? null
			})
			.run();
		callback();
	} catch (error) {
		callback(error instanceof Error ? error : new Error(String(error)));
	}
}

/** Start the stand-in once per process; resolves to its port. */
export function startStandIn(): Promise<number> {
	if (state.standInPort) return Promise.resolve(state.standInPort);
	state.starting ??= new Promise<number>((resolve, reject) => {
		const server = new SMTPServer({
			authOptional: true,
			disabledCommands: ['STARTTLS'],
			banner: 'Tacksheet local mail stand-in',
			size: 10 * 1024 * 1024,
			onData(stream, _session, callback) {
				// Every outcome reaches the callback, so nothing is left waiting on the promise.
				void keepMessage(stream, callback);
			}
		});
		server.on('error', (error) => console.error('Mail stand-in:', error.message));
		server.listen(0, '127.0.0.1', () => {
			const address = server.server.address();
			if (!address || typeof address === 'string')
				return reject(new Error('Mail stand-in did not bind'));
			state.standIn = server;
			state.standInPort = address.port;
			console.log(`Tacksheet: no SMTP_URL set; local mail stand-in on 127.0.0.1:${address.port}`);
			resolve(address.port);
		});
	});
	return state.starting;
}

export function usingStandIn(): boolean {
	return !config.smtpUrl;
}

/** What nodemailer needs to reach the mail server (also handed to Auth.js's mail provider). */
export async function transportOptions(): Promise<string | SMTPTransport.Options> {
	if (config.smtpUrl) return config.smtpUrl;
	const port = await startStandIn();
	return { host: '127.0.0.1', port, secure: false, ignoreTLS: true };
}

async function transport(): Promise<Transporter> {
	state.transport ??= nodemailer.createTransport(await transportOptions());
	return state.transport;
}

export interface Message {
	to: string;
	subject: string;
	text: string;
	html: string;
}

export async function send(message: Message): Promise<void> {
	const t = await transport();
	const info = await t.sendMail({ from: config.mailFrom, ...message });
	const refused = [...(info.rejected ?? []), ...(info.pending ?? [])];
	if (refused.length > 0) throw new Error(`Mail server refused ${refused.join(', ')}`);
}

export function listMessages({ page = 1, pageSize = 50 } = {}) {
	const items = db
		.select({
			id: schema.mailMessages.id,
			receivedAt: schema.mailMessages.receivedAt,
			to: schema.mailMessages.to,
			subject: schema.mailMessages.subject
		})
		.from(schema.mailMessages)
		.orderBy(desc(schema.mailMessages.receivedAt), desc(schema.mailMessages.id))
		.limit(pageSize)
		.offset((page - 1) * pageSize)
		.all();
	const total = db.select({ n: count() }).from(schema.mailMessages).get()?.n ?? 0;
	return { items, total, page, pageSize };
}

export function getMessage(id: number) {
	return db.select().from(schema.mailMessages).where(eq(schema.mailMessages.id, id)).get();
}

/** The newest message to an address (tests and the sign-in link flow read it back). */
export function latestTo(address: string) {
	return db
		.select()
		.from(schema.mailMessages)
		.where(eq(schema.mailMessages.to, address.toLowerCase()))
		.orderBy(desc(schema.mailMessages.id))
		.limit(1)
		.get();
}
