import type { Logger } from 'pino';
import type { AppDeps } from '../deps';
import type { Mailer } from '../integrations/mail';

export const linkUrl = (deps: Pick<AppDeps, 'config'>, path: string, token: string) => `${deps.config.publicUrl}${path}?token=${encodeURIComponent(token)}`;

/** Fire-and-forget: the answer to the requester never waits on (or reveals) delivery. */
function deliver(deps: Pick<AppDeps, 'logger' | 'mailer'>, log: Logger | undefined, message: Parameters<Mailer['send']>[0]): void {
  deps.mailer.send(message).catch((err: unknown) => (log ?? deps.logger).error({ err: (err as Error).message }, 'sign-in e-mail failed'));
}

export function sendSignInLink(deps: Pick<AppDeps, 'config' | 'logger' | 'mailer'>, to: { email: string; token: string }, log?: Logger): void {
  const url = linkUrl(deps, '/sign-in/confirm', to.token);
  deliver(deps, log, {
    to: to.email,
    subject: 'Your sign-in link',
    text: `Open this link to sign in to your home comfort portal:\n\n${url}\n\nIt works once, for 10 minutes. If you did not ask for it, you can ignore this e-mail.`,
  });
}

export function sendHouseholdInvitation(deps: Pick<AppDeps, 'config' | 'logger' | 'mailer'>, to: { email: string; name: string; token: string }, log?: Logger): void {
  const url = linkUrl(deps, '/sign-in/confirm', to.token);
  deliver(deps, log, {
    to: to.email,
    subject: 'Your home comfort portal is ready',
    text: `Hello ${to.name},\n\nYour heating and cooling company has opened a portal for your household: your service agreement, tune-up visits and invoices in one place.\n\nOpen this link to sign in (no password needed):\n\n${url}\n\nThe link works once within 3 days. Later, sign in any time by asking for a new link with this e-mail address.`,
  });
}

export function sendStaffInvitation(deps: Pick<AppDeps, 'config' | 'logger' | 'mailer'>, to: { email: string; name: string; token: string }, log?: Logger): void {
  const url = linkUrl(deps, '/set-password', to.token);
  deliver(deps, log, {
    to: to.email,
    subject: 'Set your staff password',
    text: `Hello ${to.name},\n\nYou have been added as staff. Open this link to choose your password (at least 12 characters):\n\n${url}\n\nThe link works once within 3 days.`,
  });
}

export function sendPasswordReset(deps: Pick<AppDeps, 'config' | 'logger' | 'mailer'>, to: { email: string; token: string }, log?: Logger): void {
  const url = linkUrl(deps, '/set-password', to.token);
  deliver(deps, log, {
    to: to.email,
    subject: 'Set a new password',
    text: `Open this link to set a new password:\n\n${url}\n\nIt works once, for 30 minutes. If you did not ask for it, you can ignore this e-mail; your password has not changed.`,
  });
}
