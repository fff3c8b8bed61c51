import type { AppDeps } from '../deps';
import { queueMail, type MailToQueue, type OutboxDeps } from '../mail/outbox';

type LinkMailDeps = Pick<AppDeps, 'config'> & OutboxDeps;

export const linkUrl = (deps: Pick<AppDeps, 'config'>, path: string, token: string) => `${deps.config.publicUrl}${path}?token=${encodeURIComponent(token)}`;

// Stands in for a token when the address is unknown, so that path composes the same message.
const NO_TOKEN = 'x'.repeat(43);

/**
 * Queues the mail and returns: the answer to the requester never waits on SMTP. For an unknown
 * address (`send` false) the message is composed the same way and dropped just before the queue,
 * so both answers take the same time apart from one insert.
 */
async function deliver(deps: LinkMailDeps, mail: MailToQueue, send = true): Promise<void> {
  if (!send) return;
  await queueMail(deps, mail);
}

export async function sendSignInLink(deps: LinkMailDeps, to: { email: string; token: string } | null): Promise<void> {
  const url = linkUrl(deps, '/sign-in/confirm', to?.token ?? NO_TOKEN);
  await deliver(
    deps,
    {
      kind: 'sign_in_link',
      message: {
        to: to?.email ?? 'nobody@invalid.test',
        subject: 'Your sign-in link',
        text: `Open this link to sign in to your home comfort portal:\n\n${url}\n\nIt works once, for 10 minutes. If you did not ask for it, you can ignore this e-mail.`,
      },
    },
    to !== null,
  );
}

export async function sendHouseholdInvitation(deps: LinkMailDeps, to: { email: string; name: string; token: string }): Promise<void> {
  const url = linkUrl(deps, '/sign-in/confirm', to.token);
  await deliver(deps, {
    kind: 'household_invitation',
    message: {
      to: to.email,
      subject: 'Your home comfort portal is ready',
      text: `Hello ${to.name},\n\nYour heating and cooling company has opened a portal for your household: your service agreement, tune-up visits and invoices in one place.\n\nOpen this link to sign in (no password needed):\n\n${url}\n\nThe link works once within 3 days. Later, sign in any time by asking for a new link with this e-mail address.`,
    },
  });
}

export async function sendStaffInvitation(deps: LinkMailDeps, to: { email: string; name: string; token: string }): Promise<void> {
  const url = linkUrl(deps, '/set-password', to.token);
  await deliver(deps, {
    kind: 'staff_invitation',
    message: {
      to: to.email,
      subject: 'Set your staff password',
      text: `Hello ${to.name},\n\nYou have been added as staff. Open this link to choose your password (at least 12 characters):\n\n${url}\n\nThe link works once within 3 days.`,
    },
  });
}

export async function sendPasswordReset(deps: LinkMailDeps, to: { email: string; token: string } | null): Promise<void> {
  const url = linkUrl(deps, '/set-password', to?.token ?? NO_TOKEN);
  await deliver(
    deps,
    {
      kind: 'password_reset',
      message: {
        to: to?.email ?? 'nobody@invalid.test',
        subject: 'Set a new password',
        text: `Open this link to set a new password:\n\n${url}\n\nIt works once, for 30 minutes. If you did not ask for it, you can ignore this e-mail; your password has not changed.`,
      },
    },
    to !== null,
  );
}
