import "server-only";
import { Readable } from "node:stream";
import SMTPConnection from "nodemailer/lib/smtp-connection";
import { env, isLoopbackHost, type Env } from "@/lib/env";

// One SMTP delivery in three observable phases, so the outbox can decide when a message counts as
// sent (lib/mail/actions.ts explains why):
//   1. connect, EHLO, (STARTTLS), AUTH, MAIL FROM, RCPT TO, DATA — the server answers 354;
//   2. the whole message is streamed, but the final "<CRLF>.<CRLF>" is held back;
//   3. finish() writes the terminator and waits for the server's verdict (250 = accepted).
// Until the terminator is written the server has accepted nothing: if this process dies in phase 1
// or 2, the connection drops and the server discards the partial message (RFC 5321 §4.1.1.4).
//
// nodemailer's SMTPConnection does the protocol; we feed it a stream that we end ourselves.

export type SmtpSettings = {
  host: string;
  port: number;
  secure: boolean;
  user?: string;
  password?: string;
  /** The inbox speaks plain SMTP on 127.0.0.1: no STARTTLS. */
  ignoreTLS: boolean;
  /** Refuse to send unless the connection is encrypted (STARTTLS must succeed). */
  requireTLS: boolean;
  /** Milliseconds: connect, greeting, and inactivity on the socket. */
  connectionTimeout: number;
  greetingTimeout: number;
  socketTimeout: number;
};

export function smtpSettingsFromEnv(overrides: Partial<SmtpSettings> = {}): SmtpSettings {
  return smtpSettingsFor(env(), overrides);
}

/**
 * A relay is reached over TLS: implicit TLS with SMTP_SECURE=true (port 465), else STARTTLS, and a
 * relay that does not offer STARTTLS is refused (nothing — password, invitation links — goes over the
 * network in clear). Only a relay on this machine (a loopback host, explicitly) may speak plain SMTP.
 */
export function smtpSettingsFor(
  e: Pick<Env, "MAIL_TRANSPORT" | "SMTP_HOST" | "SMTP_PORT" | "SMTP_SECURE" | "SMTP_USER" | "SMTP_PASSWORD">,
  overrides: Partial<SmtpSettings> = {},
): SmtpSettings {
  const inbox = e.MAIL_TRANSPORT === "local-inbox";
  const local = isLoopbackHost(e.SMTP_HOST);
  return {
    host: e.SMTP_HOST,
    port: e.SMTP_PORT,
    secure: inbox ? false : e.SMTP_SECURE,
    user: inbox ? undefined : e.SMTP_USER,
    password: inbox ? undefined : e.SMTP_PASSWORD,
    ignoreTLS: inbox,
    requireTLS: !inbox && !e.SMTP_SECURE && !local,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 60_000,
    ...overrides,
  };
}

export type SmtpError = Error & { code?: string; responseCode?: number; response?: string; command?: string };

/** How sure we are that the server did not take the message when a delivery fails. */
export type Acceptance = "not_accepted" | "unknown";

export class DeliveryError extends Error {
  constructor(
    readonly cause: SmtpError,
    readonly acceptance: Acceptance,
  ) {
    super(cause.message);
    this.name = "DeliveryError";
  }
}

export type PhasedDelivery = {
  /**
   * Writes the final dot and resolves with the server's reply once it accepted the message.
   * Rejects with a DeliveryError: "not_accepted" when the server refused it (a reply code) or the
   * connection was gone before the dot; "unknown" when the connection died after the dot, before
   * any reply (the server may or may not have taken it).
   */
  finish(): Promise<string>;
  /** Drops the connection without finishing: the server discards the message. */
  abort(): void;
};

/**
 * Runs phases 1 and 2 and resolves when the server has received all of the message except its end.
 * Rejects with the SMTP error when anything before that fails (nothing was accepted then).
 */
export function beginDelivery(
  settings: SmtpSettings,
  envelope: { from: string; to: string },
  raw: Buffer,
): Promise<PhasedDelivery> {
  return new Promise((resolveBegin, rejectBegin) => {
    const connection = new SMTPConnection({
      host: settings.host,
      port: settings.port,
      secure: settings.secure,
      ignoreTLS: settings.ignoreTLS,
      requireTLS: settings.requireTLS,
      connectionTimeout: settings.connectionTimeout,
      greetingTimeout: settings.greetingTimeout,
      socketTimeout: settings.socketTimeout,
      name: "benchclear.local",
    });

    // envelope → data (354 received, body pushed) → finishing (dot written) → done
    let phase: "envelope" | "data" | "finishing" | "done" = "envelope";
    let earlyError: SmtpError | null = null;
    let settle: { resolve: (reply: string) => void; reject: (error: DeliveryError) => void } | null = null;

    const done = () => {
      phase = "done";
    };

    const fail = (error: SmtpError) => {
      if (phase === "envelope") {
        done();
        connection.close();
        rejectBegin(error);
      } else if (phase === "data") {
        // Before the dot: the server cannot have accepted anything. finish() reports it.
        earlyError ??= error;
      } else if (phase === "finishing" && settle) {
        const s = settle;
        settle = null;
        done();
        connection.close();
        s.reject(new DeliveryError(error, typeof error.responseCode === "number" ? "not_accepted" : "unknown"));
      }
    };

    const body = new Readable({
      read() {
        // SMTPConnection starts reading only after the server's 354 reply to DATA.
        if (phase !== "envelope") return;
        phase = "data";
        this.push(raw);
        resolveBegin({
          finish() {
            if (phase !== "data") return Promise.reject(new Error("this delivery is not waiting to be finished"));
            if (earlyError) {
              done();
              connection.close();
              return Promise.reject(new DeliveryError(earlyError, "not_accepted"));
            }
            phase = "finishing";
            return new Promise<string>((resolve, reject) => {
              settle = { resolve, reject };
              body.push(null);
            });
          },
          abort() {
            done();
            connection.close();
          },
        });
      },
    });

    connection.on("error", (error: SmtpError) => fail(error));
    connection.once("end", () => {
      if (phase !== "done")
        fail(Object.assign(new Error("The SMTP connection closed early."), { code: "ECONNECTION" }));
    });

    connection.connect((connectError) => {
      if (connectError) return fail(connectError);
      const send = () =>
        connection.send(envelope, body, (error, info) => {
          if (error) return fail(error);
          if (phase === "finishing" && settle) {
            const s = settle;
            settle = null;
            done();
            connection.quit();
            s.resolve(String(info.response ?? ""));
          }
        });
      if (settings.user && settings.password) {
        connection.login({ user: settings.user, pass: settings.password }, (loginError) => {
          if (loginError) return fail(loginError);
          send();
        });
      } else {
        send();
      }
    });
  });
}
