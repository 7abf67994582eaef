import nodemailer from "nodemailer";

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
  /**
   * A stable Message-ID (RFC 5322 §3.6.4) for a message that may be sent again after a crash: the same
   * message keeps the same id, so mailboxes (and the local catcher) keep one copy.
   */
  messageId?: string;
}

/** Sends mail over SMTP; only configuration differs between the local catcher and a real service. */
export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
}

export function smtpMailer(smtpUrl: string, from: string): Mailer {
  const url = new URL(smtpUrl);
  const transport = nodemailer.createTransport({
    host: url.hostname,
    port: Number(url.port || 25),
    secure: url.protocol === "smtps:",
    auth: url.username ? { user: decodeURIComponent(url.username), pass: decodeURIComponent(url.password) } : undefined,
    // The loopback catcher speaks plain SMTP; a real relay negotiates TLS itself.
    ignoreTLS: url.hostname === "127.0.0.1" || url.hostname === "localhost",
  });
  return {
    async send(mail) {
      await transport.sendMail({ from, ...mail });
    },
  };
}
