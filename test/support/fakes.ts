// Local stand-ins for the app's integrations, passed explicitly to the app in tests and benches.
// Tests that read mail or pay by card pass their own (an SMTP catcher's mailer, the fake processor).
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { AppDeps } from '../../server/deps';
import type { Mailer, OutgoingMail } from '../../server/integrations/mail';
import { createLocalStorage } from '../../server/integrations/storage';
import { createStripe } from '../../server/integrations/stripe';
import { InlineJobs } from '../../server/jobs/inline';

/** A mailer that keeps what it was asked to send, for tests that do not read the mail. */
export interface MemoryMailer extends Mailer {
  sent: OutgoingMail[];
}

export function memoryMailer(): MemoryMailer {
  const sent: OutgoingMail[] = [];
  let n = 0;
  return {
    sent,
    async send(message) {
      sent.push(message);
      return { messageId: `<memory-${++n}@seasonwell.test>` };
    },
    async verify() {},
    close() {},
  };
}

/**
 * The integrations a test does not care about: mail kept in memory, jobs run at once, a card
 * processor nobody answers at (port 9 on loopback, so every call fails fast as an outage), and
 * files in a fresh temporary folder.
 */
export function localFakes(): Pick<AppDeps, 'mailer' | 'jobs' | 'stripe' | 'storage'> {
  return {
    mailer: memoryMailer(),
    jobs: new InlineJobs(),
    stripe: createStripe({ secretKey: 'sk_test_no_processor', apiUrl: 'http://127.0.0.1:9', maxNetworkRetries: 0, timeoutMs: 2000 }),
    storage: createLocalStorage(mkdtempSync(join(tmpdir(), 'sw-files-'))),
  };
}
