// Review mail goes through the outbox: when the mail server is down the message stays
// queued and is retried; once a server listens it is delivered, content intact.
import { afterAll, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import nodemailer from 'nodemailer';
import { db } from '$lib/server/db';
import { mailOutbox } from '$lib/server/db/schema';
import { deliverDue, enqueueMail } from '$lib/server/mail';
import { startMailCatcher } from '$lib/server/mail-catcher';
import { composeMail } from '$lib/server/review';
import { unique } from './helpers';
import { freePort } from './servers';

let stop: (() => Promise<void>) | null = null;
afterAll(async () => {
	await stop?.();
});

test('a review mail waits out a mail-server outage and is then delivered intact', async () => {
	const smtpPort = await freePort();
	const httpPort = await freePort();
	const to = `${unique('member')}@demo.test`;
	const mail = composeMail({
		to: { email: to, name: 'Ruthven Sallow' },
		actor: { name: 'Marisol Achterberg' },
		project: { id: 4242, name: 'Thermocouple clamp' },
		action: 'request-changes',
		toState: 'returned',
		comment: 'Add a part with a lower forward drop.',
		snapshot: { requirement: { biasV: -5, temperatureRangeC: [0, 85], leakageTargetA: 1e-9 }, entries: [] },
		link: 'http://127.0.0.1:5203/projects/4242'
	});
	// Queued an hour ahead so the app's own outbox worker leaves it to this test's clock.
	const later = new Date(Date.now() + 3600_000);
	await db.transaction(async (tx) => {
		await enqueueMail(tx, mail);
		await tx.update(mailOutbox).set({ nextAttemptAt: later }).where(eq(mailOutbox.to, to));
	});
	const transport = nodemailer.createTransport(`smtp://127.0.0.1:${smtpPort}`, { connectionTimeout: 2000, greetingTimeout: 2000, socketTimeout: 3000 });
	let clock = new Date(later.getTime() + 1000);

	// Nothing listens: the attempt fails, the message stays queued with a later retry.
	expect(await deliverDue(5, { transport, now: () => clock, to })).toEqual({ sent: 0, failed: 1 });
	const [queued] = await db.select().from(mailOutbox).where(eq(mailOutbox.to, to));
	expect(queued.sentAt).toBeNull();
	expect(queued.attempts).toBe(1);
	expect(queued.lastError).toBeTruthy();
	expect(queued.nextAttemptAt.getTime()).toBeGreaterThan(clock.getTime());
	// Not due again until the back-off has passed.
	expect(await deliverDue(5, { transport, now: () => clock, to })).toEqual({ sent: 0, failed: 0 });

	const catcher = await startMailCatcher({ smtpPort, httpPort });
	stop = catcher.stop;
	clock = new Date(queued.nextAttemptAt.getTime() + 1);
	expect(await deliverDue(5, { transport, now: () => clock, to })).toEqual({ sent: 1, failed: 0 });
	const [sent] = await db.select().from(mailOutbox).where(eq(mailOutbox.to, to));
	expect(sent.sentAt).not.toBeNull();
	expect(sent.attempts).toBe(2);

	const list = (await (await fetch(`http://127.0.0.1:${httpPort}/messages?to=${encodeURIComponent(to)}`)).json()) as {
		subject: string;
		text: string;
		html: string;
		links: string[];
	}[];
	expect(list).toHaveLength(1);
	expect(list[0].subject).toBe('Shortlist for “Thermocouple clamp”: Marisol Achterberg asks for changes');
	expect(list[0].text).toContain('Add a part with a lower forward drop.');
	expect(list[0].text).toContain('The requirement: bias −5 V, 0 °C to 85 °C, leakage target 1 nA');
	expect(list[0].links).toEqual(['http://127.0.0.1:5203/projects/4242']);
	expect(list[0].html).toContain('<a href="http://127.0.0.1:5203/projects/4242">');
	// Delivered once: a further run finds nothing due.
	expect(await deliverDue(5, { transport, now: () => new Date(clock.getTime() + 3600_000), to })).toEqual({ sent: 0, failed: 0 });
});
