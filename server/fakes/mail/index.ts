export { startSmtpCatcher, type SmtpCatcher, type SmtpCatcherOptions } from './smtp-catcher';
export { createMailboxApp } from './mailbox-app';
export { MailStore, toMessageJson, type CapturedMessage, type CapturedAttachment, type MessageJson } from './mail-store';
export { extractLinks, decodeHtmlEntities } from './links';
