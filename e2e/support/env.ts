// Where the journeys find the app and its local fakes; scripts/e2e-server.mjs uses the same ports.
const port = Number(process.env.E2E_PORT ?? 3200);
export const APP_URL = `http://localhost:${port}`;
export const MAILBOX_URL = `http://127.0.0.1:${Number(process.env.E2E_MAILBOX_PORT ?? 3201)}`;
export const STRIPE_URL = `http://127.0.0.1:${Number(process.env.E2E_STRIPE_PORT ?? 3202)}`;

export const DEMO = {
  staffPassword: 'bluestem-demo-staff-2026',
  owner: 'rosalind.okafor@bluestem-comfort.test',
  office: 'teo.marchetti@bluestem-comfort.test',
  technician: 'marcus.bellweather@bluestem-comfort.test',
  homeownerA: 'dana.whitfield@example.test',
  homeownerB: 'sam.oduya@example.test',
};

/**
 * The newest message to an address received after `after`; with `subject`, the newest one whose
 * subject matches, so that a notice queued just before (an "on the way" mail) is not mistaken for it.
 */
export async function latestMail(to: string, { after = 0, timeoutMs = 15_000, subject }: { after?: number; timeoutMs?: number; subject?: RegExp } = {}) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const res = await fetch(`${MAILBOX_URL}/api/messages/latest?to=${encodeURIComponent(to)}`);
    if (res.ok) {
      const msg = (await res.json()) as {
        id: string;
        receivedAt: string;
        subject: string;
        text: string;
        html: string;
        links: string[];
        attachments: { filename: string; contentType: string; index: number }[];
      };
      if (new Date(msg.receivedAt).getTime() > after && (!subject || subject.test(msg.subject))) return msg;
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`no mail for ${to}${subject ? ` with a subject like ${subject}` : ''} within ${timeoutMs} ms`);
}
