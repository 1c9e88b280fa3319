// Preloaded into the web server (`node --import ./scripts/lib/peer-address.mjs …/next start`): records on
// every request which address the TCP connection came from, where the app can read it and no client
// can forge it. Next.js keeps a client-sent X-Forwarded-For as it is and offers route handlers no
// socket address, so without this a client picks its own address by sending the header.
//
// The header's name is random per process and published only in this process's environment
// (BENCHCLEAR_PEER_HEADER): a client cannot guess it, and we overwrite it on every request anyway. Its
// value is the X-Forwarded-For chain as received, then the socket's address — the chain a proxy would
// have built. lib/http/client-ip.ts decides how much of it to believe (TRUSTED_PROXY_HOPS).
import crypto from "node:crypto";
import http from "node:http";
import https from "node:https";

const installed = Symbol.for("benchclear.peer-address");
// Once per process (a forked child preloads it again and gets its own name).
if (!globalThis[installed]) {
  globalThis[installed] = true;
  const name = `x-benchclear-peer-${crypto.randomBytes(12).toString("hex")}`;
  process.env.BENCHCLEAR_PEER_HEADER = name;

  const wrap = (proto) => {
    const emit = proto.emit;
    proto.emit = function emitWithPeer(event, req, ...rest) {
      if (event === "request" && req && req.headers) {
        const forwarded = req.headers["x-forwarded-for"];
        const chain = (Array.isArray(forwarded) ? forwarded.join(",") : (forwarded ?? ""))
          .split(",")
          .map((p) => p.trim())
          .filter(Boolean);
        chain.push((req.socket && req.socket.remoteAddress) || "unknown");
        req.headers[name] = chain.join(", ");
      }
      return emit.call(this, event, req, ...rest);
    };
  };
  wrap(http.Server.prototype);
  if (https.Server.prototype.emit !== http.Server.prototype.emit) wrap(https.Server.prototype);
}
