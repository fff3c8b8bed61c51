import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import express from 'express';
import { createMailboxApp, startSmtpCatcher, type SmtpCatcher } from '../../server/fakes/mail';
import { createMailer, type Mailer } from '../../server/integrations/mail';
import { parse } from '../support/jsdom';

const FROM = 'Seasonwell Office <office@seasonwell.example.test>';

describe('mailbox pages', () => {
  let catcher: SmtpCatcher;
  let mailer: Mailer;
  let app: express.Express;

  beforeAll(async () => {
    catcher = await startSmtpCatcher({ port: 0 });
    mailer = createMailer({ smtpUrl: `smtp://127.0.0.1:${catcher.port}`, from: FROM });
    app = createMailboxApp(catcher.store);
  });
  afterAll(async () => {
    mailer.close();
    await catcher.close();
  });
  beforeEach(() => catcher.store.clear());

  it('lists captured messages newest first with time, recipient and subject', async () => {
    await mailer.send({ to: 'first@example.test', subject: 'Fall tune-up booked', text: 'a' });
    await mailer.send({ to: 'second@example.test', subject: 'Repair quote ready', text: 'b' });
    const res = await request(app)
      .get('/')
      .expect(200)
      .expect('Content-Type', /text\/html/);
    const doc = parse(res.text);
    expect(doc.title).toBe('Seasonwell test mailbox');
    const rows = [...doc.querySelectorAll('tbody tr')];
    expect(rows).toHaveLength(2);
    const cells = rows.map((r) => [...r.querySelectorAll('td')].map((td) => td.textContent?.trim()));
    expect(cells[0][1]).toBe('second@example.test');
    expect(cells[0][2]).toBe('Repair quote ready');
    expect(cells[1][2]).toBe('Fall tune-up booked');
    const stamp = rows[0].querySelector('time')?.getAttribute('datetime') ?? '';
    expect(Number.isNaN(Date.parse(stamp))).toBe(false);
    const href = rows[0].querySelector('a')?.getAttribute('href');
    expect(href).toBe(`/messages/${catcher.store.latest()!.id}`);
  });

  it('is self-contained: no scripts, external styles, fonts or images', async () => {
    await mailer.send({ to: 'first@example.test', subject: 'Plain', text: 'a', html: '<p>Hi <img src="https://img.example.test/p.gif"></p>' });
    for (const path of ['/', `/messages/${catcher.store.latest()!.id}`]) {
      const res = await request(app).get(path).expect(200);
      const doc = parse(res.text);
      expect(doc.querySelectorAll('script, link, img, object, embed')).toHaveLength(0);
      expect(res.text).not.toMatch(/@import|url\(/);
      // CSP Level 3: default-src 'none' blocks every fetch a page or its srcdoc frame could make.
      expect(res.headers['content-security-policy']).toContain("default-src 'none'");
      expect(res.headers['content-security-policy']).not.toMatch(/script-src/);
    }
  });

  it('escapes a subject that contains markup', async () => {
    const subject = `<script>alert("owned")</script> & <b>bold</b> 'quote'`;
    await mailer.send({ to: 'first@example.test', subject, text: 'x' });
    const list = await request(app).get('/').expect(200);
    const doc = parse(list.text);
    expect(doc.querySelectorAll('script, b')).toHaveLength(0);
    expect(doc.querySelector('tbody tr td:nth-child(3) a')?.textContent).toBe(subject);
    expect(list.text).not.toContain('<script>alert');

    const view = await request(app).get(`/messages/${catcher.store.latest()!.id}`).expect(200);
    const viewDoc = parse(view.text);
    expect(viewDoc.querySelectorAll('script, b')).toHaveLength(0);
    expect(viewDoc.title.startsWith(subject)).toBe(true);
  });

  it('filters the list by recipient and escapes the filter', async () => {
    await mailer.send({ to: 'first@example.test', subject: 'One', text: 'a' });
    await mailer.send({ to: 'second@example.test', subject: 'Two', text: 'b' });
    const doc = parse((await request(app).get('/').query({ to: 'FIRST@example.test' }).expect(200)).text);
    expect([...doc.querySelectorAll('tbody tr')].map((r) => r.querySelector('a')?.textContent)).toEqual(['One']);
    const odd = '"><script>x</script>';
    const none = parse((await request(app).get('/').query({ to: odd }).expect(200)).text);
    expect(none.querySelectorAll('script')).toHaveLength(0);
    expect(none.querySelector('input[name=to]')?.value).toBe(odd);
  });

  it('shows a message with headers, text, a sandboxed HTML body and attachment links', async () => {
    const html = '<h1>Visit confirmed</h1><script>document.title="run"</script><p onclick="x()">Arrival 8&ndash;10 am</p>';
    const ics = 'BEGIN:VCALENDAR\r\nVERSION:2.0\r\nPRODID:-//Seasonwell test//EN\r\nEND:VCALENDAR\r\n';
    await mailer.send({
      to: 'first@example.test',
      subject: 'Visit confirmed',
      text: 'Arrival window 8–10 am.\nBring the gate code.',
      html,
      attachments: [{ filename: 'visit.ics', content: ics, contentType: 'text/calendar' }],
    });
    const m = catcher.store.latest()!;
    const res = await request(app).get(`/messages/${m.id}`).expect(200);
    const doc = parse(res.text);

    const meta = Object.fromEntries([...doc.querySelectorAll('section[aria-label=Headers] dt')].map((dt) => [dt.textContent, dt.nextElementSibling?.textContent]));
    expect(meta.From).toContain('office@seasonwell.example.test');
    expect(meta.To).toBe('first@example.test');
    expect(meta.Subject).toBe('Visit confirmed');

    expect(doc.querySelector('pre')?.textContent).toBe(m.text);
    expect(m.text).toContain('Bring the gate code.');

    const frame = doc.querySelector('iframe');
    expect(frame).not.toBeNull();
    // HTML standard: an empty sandbox attribute applies every restriction, scripts included.
    expect(frame!.getAttribute('sandbox')).toBe('');
    expect(frame!.getAttribute('srcdoc')).toBe(m.html);
    expect(m.html).toContain('<script>');
    expect(doc.querySelectorAll('script')).toHaveLength(0);

    const link = doc.querySelector('section[aria-label=Attachments] a');
    expect(link?.textContent).toBe('visit.ics');
    const file = await request(app).get(link!.getAttribute('href')!).expect(200);
    expect(file.text).toBe(ics);
    // RFC 6266 §4.1: filename may be a token or a quoted string.
    expect(file.headers['content-disposition']).toMatch(/^attachment; filename="?visit\.ics"?$/);
    // CSP Level 3 sandbox directive: an attached page cannot run script on this origin.
    expect(file.headers['content-security-policy']).toBe('sandbox');
    expect(doc.querySelector('details summary')?.textContent).toBe('All headers');
  });

  it('answers 404 for an unknown message page', async () => {
    const res = await request(app).get('/messages/nope').expect(404);
    expect(parse(res.text).body.textContent).toContain('No message with id nope');
  });

  it('clears from the page and returns to the list', async () => {
    await mailer.send({ to: 'first@example.test', subject: 'One', text: 'a' });
    await request(app).post('/clear').expect(303).expect('Location', '/');
    expect(catcher.store.size).toBe(0);
    expect(parse((await request(app).get('/').expect(200)).text).querySelector('.empty')?.textContent).toBe('No messages yet.');
  });

  it('keeps its links working when mounted under a path', async () => {
    await mailer.send({
      to: 'first@example.test',
      subject: 'Mounted',
      text: 'a',
      attachments: [{ filename: 'a.txt', content: 'hello' }],
    });
    const outer = express();
    outer.use('/mail', createMailboxApp(catcher.store));
    const doc = parse((await request(outer).get('/mail/').expect(200)).text);
    const href = doc.querySelector('tbody a')!.getAttribute('href')!;
    expect(href).toMatch(/^\/mail\/messages\/\d+$/);
    const view = parse((await request(outer).get(href).expect(200)).text);
    const att = view.querySelector('section[aria-label=Attachments] a')!.getAttribute('href')!;
    expect((await request(outer).get(att).expect(200)).text).toBe('hello');
    expect(doc.querySelector('form[method=post]')?.getAttribute('action')).toBe('/mail/clear');
    await request(outer).get('/mail/api/messages/latest').expect(200);
  });
});
