// The child process that runs the local fakes of hosted services (the sign-in provider and the
// mail inbox) for `npm start` and the browser tests. Never used in production.
import { loadConfig } from '../config';
import { createLogger } from '../logger';
import { startSmtpInbox } from '../fakes/smtp-inbox';
import { startFakeOAuthProvider } from '../fakes/oauth-provider';
import { watchParent } from './parent-watch';
import { portOf } from './util';

const config = loadConfig();
const logger = createLogger(config, 'fakes');

const inbox = await startSmtpInbox({ host: config.HOST, smtpPort: config.SMTP_PORT, httpPort: portOf(config.DEV_MAILBOX_URL, 80) });
logger.info({ smtp: `${config.HOST}:${inbox.smtpPort}`, http: inbox.httpUrl }, 'mail inbox listening');

const oauth = await startFakeOAuthProvider({
  host: new URL(config.OAUTH_BASE_URL).hostname,
  port: portOf(config.OAUTH_BASE_URL, 80),
  callbackHosts: [`${config.HOST}:${config.PORT}`, `localhost:${config.PORT}`, `127.0.0.1:${config.PORT}`],
});
logger.info({ url: oauth.url }, 'sign-in provider listening');

let closing = false;
async function shutdown(reason: string) {
  if (closing) return;
  closing = true;
  logger.info({ reason }, 'stopping fakes');
  await Promise.allSettled([inbox.close(), oauth.close()]);
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));
watchParent(() => void shutdown('parent exited'));
