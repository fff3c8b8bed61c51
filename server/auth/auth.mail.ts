import type { Logger } from 'pino';
import type { AppDeps } from '../app';
import type { Mailer } from '../integrations/mail';

function mailerOf(deps: AppDeps): Mailer | undefined {
  return (deps.services as { mailer?: Mailer } | undefined)?.mailer;
}

export const linkUrl = (deps: AppDeps, path: string, token: string) => `${deps.config.publicUrl}${path}?token=${encodeURIComponent(token)}`;

/** Fire-and-forget: the answer to the requester never waits on (or reveals) delivery. */
function deliver(deps: AppDeps, log: Logger | undefined, message: Parameters<Mailer['send']>[0]): void {
  const mailer = mailerOf(deps);
  if (!mailer) {
    (log ?? deps.logger).warn('no mailer configured; sign-in e-mail not sent');
    return;
  }
  mailer.send(message).catch((err: unknown) => (log ?? deps.logger).error({ err: (err as Error).message }, 'sign-in e-mail failed'));
}

export function sendSignInLink(deps: AppDeps, to: { email: string; token: string }, log?: Logger): void {
  const url = linkUrl(deps, '/sign-in/confirm', to.token);
  deliver(deps, log, {
    to: to.email,
    subject: 'Your sign-in link',
    text: `Open this link to sign in to your home comfort portal:\n\n${url}\n\nIt works once, for 10 minutes. If you did not ask for it, you can ignore this e-mail.`,
  });
}
