import { createServer, type Server } from 'node:http';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';

export type CaughtMessage = {
	id: number;
	receivedAt: string;
	from: string;
	to: string[];
	subject: string;
	text: string;
	html: string;
	links: string[];
};

/** Links a person would follow in a message (sign-in, invitations, reviews). */
function extractLinks(text: string): string[] {
	return [...new Set(text.match(/https?:\/\/[^\s<>"')]+/g) ?? [])];
}

/**
 * A loopback SMTP server (smtp-server) that parses each message (mailparser) and keeps it
 * in memory, with a tiny JSON view: GET /messages, GET /messages/:id, DELETE /messages.
 */
export async function startMailCatcher(opts: { smtpPort: number; httpPort: number }) {
	const messages: CaughtMessage[] = [];
	let nextId = 1;

	const smtp = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS', 'AUTH'],
		logger: false,
		size: 5 * 1024 * 1024,
		onData(stream, session, callback) {
			simpleParser(stream)
				.then((mail) => {
					const text = mail.text ?? '';
					messages.push({
						id: nextId++,
						receivedAt: new Date().toISOString(),
						from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
						to: session.envelope.rcptTo.map((r) => r.address),
						subject: mail.subject ?? '',
						text,
						html: typeof mail.html === 'string' ? mail.html : '',
						links: extractLinks(text)
					});
					if (messages.length > 500) messages.shift();
					callback();
				})
				.catch((e: Error) => callback(e));
		}
	});

	const http: Server = createServer((req, res) => {
		const url = new URL(req.url ?? '/', 'http://127.0.0.1');
		const send = (status: number, body: unknown) => {
			res.writeHead(status, { 'content-type': 'application/json' });
			res.end(JSON.stringify(body));
		};
		if (req.method === 'DELETE' && url.pathname === '/messages') {
			messages.length = 0;
			return send(200, { ok: true });
		}
		if (req.method === 'GET' && url.pathname === '/messages') {
			const to = url.searchParams.get('to');
			const list = to ? messages.filter((m) => m.to.includes(to.toLowerCase())) : messages;
			return send(200, [...list].reverse());
		}
		const match = url.pathname.match(/^\/messages\/(\d+)$/);
		if (req.method === 'GET' && match) {
			const m = messages.find((x) => x.id === Number(match[1]));
			return m ? send(200, m) : send(404, { error: 'no such message' });
		}
		send(404, { error: 'not found' });
	});

	await new Promise<void>((resolve, reject) => {
		smtp.once('error', reject);
		smtp.listen(opts.smtpPort, '127.0.0.1', () => resolve());
	});
	await new Promise<void>((resolve, reject) => {
		http.once('error', reject);
		http.listen(opts.httpPort, '127.0.0.1', () => resolve());
	});

	return {
		messages,
		async stop() {
			await new Promise<void>((r) => smtp.close(() => r()));
			await new Promise<void>((r) => http.close(() => r()));
		}
	};
}
