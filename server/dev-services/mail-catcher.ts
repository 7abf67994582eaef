import fs from "node:fs";
import http from "node:http";
import { SMTPServer } from "smtp-server";
import { simpleParser } from "mailparser";

/** A message as the local mail catcher kept it. */
export interface CaughtMessage {
  to: string[];
  from: string;
  subject: string;
  sentAt: string;
  text: string;
  html: string | null;
  messageId?: string | null;
}

export interface MailCatcherOptions {
  smtpPort: number;
  httpPort?: number;
  host?: string;
  /** JSON-lines file so caught mail survives a restart of `npm start`. */
  storeFile?: string;
}

/**
 * The local stand-in for the shop's mail service: accepts SMTP on loopback and
 * keeps every message, which the app's outbox page reads over HTTP.
 */
export async function startMailCatcher(opts: MailCatcherOptions) {
  const host = opts.host ?? "127.0.0.1";
  const messages: CaughtMessage[] = [];
  let failuresToInject = 0;
  let duplicates = 0;
  let delayMs = 0;
  if (opts.storeFile && fs.existsSync(opts.storeFile)) {
    for (const line of fs.readFileSync(opts.storeFile, "utf8").split("\n")) {
      if (line.trim()) messages.push(JSON.parse(line));
    }
  }

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    onData(stream, session, done) {
      const callback = (err?: Error | null) => (delayMs ? void setTimeout(() => done(err), delayMs) : done(err));
      if (failuresToInject > 0) {
        failuresToInject--;
        stream.resume();
        stream.on("end", () => {
          const err = new Error("451 Temporary local failure (injected)") as Error & { responseCode: number };
          err.responseCode = 451;
          callback(err);
        });
        return;
      }
      simpleParser(stream)
        .then((parsed) => {
          // Like a mailbox, the catcher keeps one copy of a message sent twice under one Message-ID.
          const id = parsed.messageId ?? null;
          if (id && messages.some((m) => m.messageId === id && m.to.join() === session.envelope.rcptTo.map((r) => r.address).join())) {
            duplicates++;
            return callback();
          }
          const msg: CaughtMessage = {
            to: session.envelope.rcptTo.map((r) => r.address),
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
            subject: parsed.subject ?? "",
            sentAt: new Date().toISOString(),
            text: parsed.text ?? "",
            html: typeof parsed.html === "string" ? parsed.html : null,
            messageId: id,
          };
          messages.push(msg);
          if (opts.storeFile) fs.appendFileSync(opts.storeFile, JSON.stringify(msg) + "\n");
          callback();
        })
        .catch((e) => callback(e));
    },
  });
  await new Promise<void>((resolve, reject) => {
    smtp.once("error", reject);
    smtp.listen(opts.smtpPort, host, () => resolve());
  });

  let httpServer: http.Server | null = null;
  if (opts.httpPort !== undefined) {
    httpServer = http.createServer((req, res) => {
      if (req.url?.startsWith("/messages") && req.method === "GET") {
        res.setHeader("content-type", "application/json");
        res.end(JSON.stringify(messages));
      } else if (req.url?.startsWith("/messages") && req.method === "DELETE") {
        messages.length = 0;
        if (opts.storeFile) fs.writeFileSync(opts.storeFile, "");
        res.statusCode = 204;
        res.end();
      } else {
        res.statusCode = 404;
        res.end();
      }
    });
    await new Promise<void>((resolve) => httpServer!.listen(opts.httpPort, host, () => resolve()));
  }

  return {
    smtpPort: (smtp.server.address() as { port: number }).port,
    httpPort: httpServer ? (httpServer.address() as { port: number }).port : null,
    messages: () => [...messages],
    /** Deliveries of a message already kept under its Message-ID (re-sends after a crash). */
    duplicates: () => duplicates,
    /** Makes every delivery take this long before it is accepted (a slow mail server). */
    slowDown: (ms: number) => {
      delayMs = ms;
    },
    clear: () => {
      messages.length = 0;
    },
    /** Makes the next n deliveries fail with a temporary SMTP error. */
    failNext: (n: number) => {
      failuresToInject = n;
    },
    close: async () => {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
      if (httpServer) await new Promise<void>((resolve) => httpServer!.close(() => resolve()));
    },
  };
}
export type MailCatcher = Awaited<ReturnType<typeof startMailCatcher>>;
