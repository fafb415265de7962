export { appBaseUrl, mailConfig, type MailConfig } from "./config";
export { listOutbox, outboxDir, writeOutboxMessage, type OutboxMessage } from "./outbox";
export { MailError, sendMail, type MailMessage, type SentMail } from "./send";
export * from "./templates";
