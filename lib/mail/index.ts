export { appBaseUrl, mailConfig, type MailConfig } from "./config";
export { listOutbox, outboxDir, writeOutboxMessage, type OutboxAttachment, type OutboxMessage } from "./outbox";
export { MailError, sendMail, type MailAttachment, type MailMessage, type SentMail } from "./send";
export * from "./templates";
