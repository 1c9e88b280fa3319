// The local inbox: an SMTP server on 127.0.0.1 that accepts every message and keeps it as a
// JSON file (parsed with mailparser) under LOCAL_INBOX_DIR, newest last. Started by `npm start`,
// `npm run dev` and `npm test`; admins read it at /dev/mail. Never used in production.
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";

const port = Number(process.env.INBOX_PORT ?? 1025);
const dir = path.resolve(process.env.LOCAL_INBOX_DIR ?? ".data/mail");
fs.mkdirSync(dir, { recursive: true });

const MAX_MESSAGE_BYTES = 30 * 1024 * 1024;

const server = new SMTPServer({
  authOptional: true,
  disabledCommands: ["STARTTLS"],
  size: MAX_MESSAGE_BYTES,
  banner: "Benchclear local inbox",
  onData(stream, session, callback) {
    simpleParser(stream)
      .then((mail) => {
        const id = `${Date.now()}-${crypto.randomBytes(4).toString("hex")}`;
        const record = {
          id,
          receivedAt: new Date().toISOString(),
          envelope: {
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
            to: session.envelope.rcptTo.map((r) => r.address),
          },
          messageId: mail.messageId ?? null,
          subject: mail.subject ?? "",
          from: mail.from?.text ?? "",
          to: Array.isArray(mail.to) ? mail.to.map((a) => a.text).join(", ") : (mail.to?.text ?? ""),
          headers: Object.fromEntries(
            [...mail.headers.entries()].map(([k, v]) => [k, typeof v === "string" ? v : JSON.stringify(v)]),
          ),
          text: mail.text ?? "",
          html: typeof mail.html === "string" ? mail.html : "",
          attachments: mail.attachments.map((a) => ({
            filename: a.filename ?? null,
            contentType: a.contentType,
            size: a.size,
            content: a.content.toString("base64"),
          })),
        };
        // Write then rename, so a reader never sees half a message.
        const file = path.join(dir, `${id}.json`);
        fs.writeFileSync(`${file}.tmp`, JSON.stringify(record));
        fs.renameSync(`${file}.tmp`, file);
        callback();
      })
      .catch((error: Error) => callback(error));
  },
});

server.on("error", (error) => console.error("[local inbox]", error.message));
server.listen(port, "127.0.0.1", () => console.log(`  local inbox listening on 127.0.0.1:${port} → ${dir}`));

const stop = () => server.close(() => process.exit(0));
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
