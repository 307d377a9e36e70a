// Development and test mail catcher: an SMTP server on loopback that keeps every message
// in memory and lists them as JSON over HTTP, for the dev mailbox page and the tests.
import { startMailCatcher } from '../src/lib/server/mail-catcher';

const smtpPort = Number(process.env.MAIL_SMTP_PORT ?? 2525);
const httpPort = Number(process.env.MAIL_HTTP_PORT ?? 2526);
const catcher = await startMailCatcher({ smtpPort, httpPort });
console.log(`mail catcher: SMTP 127.0.0.1:${smtpPort}, HTTP http://127.0.0.1:${httpPort}/messages`);
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
	process.on(signal, async () => {
		await catcher.stop();
		process.exit(0);
	});
}
