import http from "node:http";
import path from "node:path";
import { simpleParser, type ParsedMail } from "mailparser";
import { SMTPServer } from "smtp-server";

/**
 * A local SMTP catcher for development and tests: accepts every message on SMTP (no auth, loopback only) and serves
 * them as JSON on HTTP, so tests can read e-mailed links and calendar attachments. Not for production.
 *   GET  /api/messages            → [{ id, to, from, subject, date, text, html, attachments: [{ filename, contentType, size }] }]
 *   GET  /api/messages/:id/attachments/:index → the raw attachment
 *   DELETE /api/messages          → clears the inbox
 *   GET  /                        → a plain HTML list for people
 */
export interface CaughtMessage {
  id: number;
  to: string[];
  from: string;
  subject: string;
  date: string;
  text: string;
  html: string;
  attachments: { filename: string; contentType: string; size: number; content: Buffer }[];
}

export interface MailCatcher {
  smtpPort: number;
  httpPort: number;
  messages: CaughtMessage[];
  close(): Promise<void>;
}

function addresses(field: ParsedMail["to"]): string[] {
  const list = Array.isArray(field) ? field : field ? [field] : [];
  return list.flatMap((a) => a.value.map((v) => (v.address ?? "").toLowerCase()));
}

export async function startMailCatcher(opts: { smtpPort?: number; httpPort?: number; quiet?: boolean } = {}): Promise<MailCatcher> {
  const messages: CaughtMessage[] = [];
  let nextId = 1;
  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then((mail) => {
          messages.push({
            id: nextId++,
            to: addresses(mail.to),
            from: mail.from?.text ?? "",
            subject: mail.subject ?? "",
            date: (mail.date ?? new Date()).toISOString(),
            text: mail.text ?? "",
            html: typeof mail.html === "string" ? mail.html : "",
            attachments: mail.attachments.map((a) => ({
              filename: a.filename ?? "attachment",
              contentType: a.contentType,
              size: a.size,
              content: a.content,
            })),
          });
          if (!opts.quiet) console.log(`[mail] to ${addresses(mail.to).join(", ")}: ${mail.subject}`);
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });
  const smtpPort = opts.smtpPort ?? 1025;
  await new Promise<void>((resolve, reject) => {
    smtp.once("error", reject);
    smtp.listen(smtpPort, "127.0.0.1", () => resolve());
  });

  const summary = (m: CaughtMessage) => ({
    ...m,
    attachments: m.attachments.map(({ filename, contentType, size }) => ({ filename, contentType, size })),
  });
  const server = http.createServer((req, res) => {
    const url = new URL(req.url ?? "/", "http://localhost");
    const attachment = url.pathname.match(/^\/api\/messages\/(\d+)\/attachments\/(\d+)$/);
    if (req.method === "GET" && url.pathname === "/api/messages") {
      res.writeHead(200, { "content-type": "application/json" });
      res.end(JSON.stringify(messages.map(summary)));
    } else if (req.method === "DELETE" && url.pathname === "/api/messages") {
      messages.length = 0;
      res.writeHead(204).end();
    } else if (req.method === "GET" && attachment) {
      const file = messages.find((m) => m.id === Number(attachment[1]))?.attachments[Number(attachment[2])];
      if (!file) return void res.writeHead(404).end("no such attachment");
      res.writeHead(200, { "content-type": file.contentType });
      res.end(file.content);
    } else if (req.method === "GET" && url.pathname === "/") {
      const esc = (s: string) => s.replace(/[&<>"]/g, (c) => `&#${c.charCodeAt(0)};`);
      res.writeHead(200, { "content-type": "text/html; charset=utf-8" });
      res.end(
        `<!doctype html><title>Kinarc local mail</title><h1>Local mail catcher (development only)</h1>` +
          [...messages]
            .reverse()
            .map((m) => `<article><h2>${esc(m.subject)}</h2><p>To ${esc(m.to.join(", "))} · ${esc(m.date)}</p><pre>${esc(m.text)}</pre></article>`)
            .join("<hr>"),
      );
    } else {
      res.writeHead(404).end();
    }
  });
  const httpPort = opts.httpPort ?? 1080;
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(httpPort, "127.0.0.1", () => resolve());
  });
  return {
    smtpPort,
    httpPort,
    messages,
    async close() {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(__filename)) {
  startMailCatcher({
    smtpPort: Number(process.env.MAIL_CATCHER_SMTP_PORT ?? 1025),
    httpPort: Number(process.env.MAIL_CATCHER_HTTP_PORT ?? 1080),
  }).then((m) => console.log(`Local mail catcher (development stand-in): SMTP 127.0.0.1:${m.smtpPort}, inbox http://localhost:${m.httpPort}`));
}
