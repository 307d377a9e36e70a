import nodemailer, { type Transporter } from 'nodemailer';
import { and, asc, eq, isNull, lte, sql } from 'drizzle-orm';
import { db, type DbOrTx } from './db';
import { mailOutbox } from './db/schema';
import { readDeployment } from './deployment';

export type Mail = { to: string; subject: string; text: string; html: string };

const FROM = process.env.MAIL_FROM ?? 'Junctionary <no-reply@junctionary.test>';
let transport: Transporter | null = null;

function getTransport(): Transporter {
	// Short timeouts: a missing mail server must fail fast and leave the message queued.
	// SMTP_URL for a team; the local catcher in a demo.
	transport ??= nodemailer.createTransport(readDeployment().smtpUrl, {
		connectionTimeout: 3000,
		greetingTimeout: 3000,
		socketTimeout: 5000
	});
	return transport;
}

/** Sends at once (sign-in links: the person is waiting for it). */
export async function sendNow(mail: Mail, transporter: Transporter = getTransport()) {
	await transporter.sendMail({ from: FROM, ...mail });
}

/** Queues a message in the caller's transaction; the outbox worker delivers it. */
export async function enqueueMail(tx: DbOrTx, mail: Mail) {
	await tx.insert(mailOutbox).values(mail);
}

const MAX_ATTEMPTS = 20;

/**
 * Delivers due messages. Each row is claimed with FOR UPDATE SKIP LOCKED so several app
 * processes can run the worker side by side; failures back off up to five minutes.
 * Options (for tests that own their messages): `transport` replaces the SMTP_URL transport,
 * `now` is the clock that decides what is due and when to retry, `to` limits to one address.
 */
export async function deliverDue(
	limit = 20,
	opts: { transport?: Transporter; now?: () => Date; to?: string } = {}
): Promise<{ sent: number; failed: number }> {
	const now = opts.now ?? (() => new Date());
	let sent = 0;
	let failed = 0;
	for (let i = 0; i < limit; i++) {
		const done = await db.transaction(async (tx) => {
			const [row] = await tx
				.select()
				.from(mailOutbox)
				.where(
					and(
						isNull(mailOutbox.sentAt),
						lte(mailOutbox.nextAttemptAt, now()),
						opts.to === undefined ? undefined : eq(mailOutbox.to, opts.to),
						sql`${mailOutbox.attempts} < ${MAX_ATTEMPTS}`
					)
				)
				.orderBy(asc(mailOutbox.id))
				.limit(1)
				.for('update', { skipLocked: true });
			if (!row) return null;
			try {
				await sendNow({ to: row.to, subject: row.subject, text: row.text, html: row.html }, opts.transport ?? getTransport());
				await tx.update(mailOutbox).set({ sentAt: now(), attempts: row.attempts + 1 }).where(eq(mailOutbox.id, row.id));
				return 'sent' as const;
			} catch (e) {
				const backoffMs = Math.min(300_000, 1000 * 2 ** row.attempts);
				await tx
					.update(mailOutbox)
					.set({
						attempts: row.attempts + 1,
						nextAttemptAt: new Date(now().getTime() + backoffMs),
						lastError: e instanceof Error ? e.message : String(e)
					})
					.where(eq(mailOutbox.id, row.id));
				return 'failed' as const;
			}
		});
		if (done === null) break;
		if (done === 'sent') sent++;
		else {
			failed++;
			break; // the server is likely down: try again on the next tick
		}
	}
	return { sent, failed };
}

let timer: ReturnType<typeof setInterval> | null = null;

/** Polls the outbox every `everyMs` in this process. */
export function startOutboxWorker(everyMs = 2000) {
	if (timer) return;
	let busy = false;
	timer = setInterval(async () => {
		if (busy) return;
		busy = true;
		try {
			await deliverDue();
		} catch {
			// database unavailable: the next tick tries again
		} finally {
			busy = false;
		}
	}, everyMs);
	timer.unref?.();
}

export function stopOutboxWorker() {
	if (timer) clearInterval(timer);
	timer = null;
}
