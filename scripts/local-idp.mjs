#!/usr/bin/env node
// The local identity provider: an OpenID Connect provider (the `oidc-provider` package) standing in for
// the institution's hosted one, for `npm start` with BENCHCLEAR_DEMO_SSO=1 and for `npm test`. One
// confidential client (Benchclear), authorization code with PKCE (S256) required, and a small login
// page of its own with the demo accounts of the fictional Aldermere Institute of Technology. Never
// for production: its keys live in memory and its passwords are printed in the README.
//
// Environment: LOCAL_IDP_PORT (default 3009), LOCAL_IDP_CLIENT_ID, LOCAL_IDP_CLIENT_SECRET,
// LOCAL_IDP_REDIRECT_URIS (space-separated; default <APP_URL>/api/auth/callback/institution).
import crypto from "node:crypto";
import http from "node:http";
import Provider from "oidc-provider";
import { LOCAL_IDP_ACCOUNTS, LOCAL_IDP_PASSWORD } from "./lib/local-idp-accounts.mjs";

const port = Number(process.env.LOCAL_IDP_PORT ?? 3009);
const host = process.env.LOCAL_IDP_HOST ?? "127.0.0.1";
const issuer = `http://${host}:${port}`;
const appUrl = process.env.APP_URL ?? "http://localhost:3000";
const clientId = process.env.LOCAL_IDP_CLIENT_ID ?? "benchclear-local";
const clientSecret = process.env.LOCAL_IDP_CLIENT_SECRET;
if (!clientSecret || clientSecret.length < 16) {
  console.error("local identity provider: LOCAL_IDP_CLIENT_SECRET (16+ characters) is required");
  process.exit(1);
}
const redirectUris = (
  process.env.LOCAL_IDP_REDIRECT_URIS ?? `${appUrl.replace(/\/$/, "")}/api/auth/callback/institution`
)
  .split(/\s+/)
  .filter(Boolean);

// Where the provider may send the browser after signing out (RP-initiated logout): each app's
// sign-in page, beside each registered callback.
const postLogoutRedirectUris = redirectUris.map((uri) =>
  uri.replace(/\/api\/auth\/callback\/institution$/, "/sign-in"),
);

const byLogin = new Map(LOCAL_IDP_ACCOUNTS.map((a) => [a.login, a]));
const bySub = new Map(LOCAL_IDP_ACCOUNTS.map((a) => [a.sub, a]));

// Keys made at start-up and kept in memory: a restart invalidates nothing Benchclear keeps (it
// stores no provider token), only sessions at this provider.
const signingKey = {
  ...crypto.generateKeyPairSync("rsa", { modulusLength: 2048 }).privateKey.export({ format: "jwk" }),
  kid: crypto.randomUUID(),
  use: "sig",
  alg: "RS256",
};

const provider = new Provider(issuer, {
  clients: [
    {
      client_id: clientId,
      client_secret: clientSecret,
      redirect_uris: redirectUris,
      post_logout_redirect_uris: postLogoutRedirectUris,
      grant_types: ["authorization_code"],
      response_types: ["code"],
      token_endpoint_auth_method: "client_secret_basic",
      // auth_time in every ID token: Benchclear asks for a fresh sign-in before a signature.
      require_auth_time: true,
    },
  ],
  jwks: { keys: [signingKey] },
  cookies: { keys: [crypto.randomBytes(32).toString("base64url")] },
  pkce: { methods: ["S256"], required: () => true },
  claims: {
    openid: ["sub"],
    email: ["email", "email_verified"],
    profile: ["name", "department", "groups"],
  },
  features: {
    devInteractions: { enabled: false },
    // OpenID Connect RP-Initiated Logout 1.0: Benchclear's sign-out sends the browser to the
    // end_session_endpoint with id_token_hint and post_logout_redirect_uri. The provider's
    // confirmation is answered "yes" by the page itself (a person signing out of Benchclear asked
    // for it); without scripts the button does it.
    rpInitiatedLogout: {
      enabled: true,
      async logoutSource(ctx, form) {
        ctx.type = "html";
        ctx.body = page(
          "Signing you out",
          `${form.replace("</form>", '<input type="hidden" name="logout" value="yes"></form>')}
<button type="submit" form="op.logoutForm">Sign out of your institute account</button>
<script>document.getElementById("op.logoutForm").submit();</script>`,
        );
      },
      async postLogoutSuccessSource(ctx) {
        ctx.type = "html";
        ctx.body = page("Signed out", "<p>You are signed out of your institute account.</p>");
      },
    },
  },
  interactions: { url: (_ctx, interaction) => `/interaction/${interaction.uid}` },
  async findAccount(_ctx, sub) {
    const account = bySub.get(sub);
    if (!account) return undefined;
    return {
      accountId: sub,
      async claims() {
        return {
          sub,
          name: account.name,
          email: account.email,
          email_verified: true,
          department: account.department,
          groups: account.groups,
        };
      },
    };
  },
  renderError(ctx, out) {
    ctx.type = "html";
    ctx.body = page("Sign-in problem", `<p>${escape(out.error)}: ${escape(out.error_description ?? "")}</p>`);
  },
});

function escape(text) {
  return String(text).replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

function page(title, body) {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${escape(title)}</title>
<meta name="viewport" content="width=device-width, initial-scale=1">
<style>body{font:16px/1.5 system-ui,sans-serif;max-width:28rem;margin:3rem auto;padding:0 1rem;color:#1c1917}
label{display:block;margin-top:1rem;font-weight:600}input{width:100%;padding:.5rem;font:inherit;box-sizing:border-box}
button{margin-top:1.25rem;padding:.6rem 1.2rem;font:inherit;background:#1e3a5f;color:#fff;border:0;border-radius:.375rem}
.note{font-size:.875rem;color:#57534e}.error{color:#991b1b;font-weight:600}</style></head>
<body><p class="note">Aldermere Institute of Technology</p><h1>${escape(title)}</h1>${body}</body></html>`;
}

function loginPage(uid, error, login = "") {
  const accounts = LOCAL_IDP_ACCOUNTS.map((a) => `<li><code>${a.login}</code> — ${escape(a.name)}</li>`).join("");
  return page(
    "Sign in to your institute account",
    `${error ? `<p class="error" role="alert">${escape(error)}</p>` : ""}
<form method="post" action="/interaction/${uid}/login">
<label for="login">Username</label><input id="login" name="login" autocomplete="username" value="${escape(login)}" required>
<label for="password">Password</label><input id="password" name="password" type="password" autocomplete="current-password" required>
<button type="submit">Sign in</button></form>
<p class="note">Local identity provider for the Benchclear demo. Accounts (password <code>${LOCAL_IDP_PASSWORD}</code>):</p>
<ul class="note">${accounts}</ul>`,
  );
}

async function readForm(req) {
  let body = "";
  for await (const chunk of req) {
    body += chunk;
    if (body.length > 10_000) throw new Error("form too large");
  }
  return new URLSearchParams(body);
}

const callback = provider.callback();

async function interaction(req, res, uid, action) {
  const details = await provider.interactionDetails(req, res);
  if (details.uid !== uid) throw new Error("interaction mismatch");
  const { prompt, params, session } = details;
  if (prompt.name === "login") {
    if (req.method === "GET") {
      res.writeHead(200, { "content-type": "text/html; charset=utf-8" });
      res.end(loginPage(uid));
      return;
    }
    if (req.method === "POST" && action === "login") {
      const form = await readForm(req);
      const account = byLogin.get(String(form.get("login") ?? "").trim());
      if (!account || form.get("password") !== LOCAL_IDP_PASSWORD) {
        res.writeHead(200, { "content-type": "text/html; charset=utf-8" });
        res.end(loginPage(uid, "That username and password do not match.", String(form.get("login") ?? "")));
        return;
      }
      await provider.interactionFinished(
        req,
        res,
        { login: { accountId: account.sub } },
        { mergeWithLastSubmission: false },
      );
      return;
    }
  }
  if (prompt.name === "consent") {
    // Benchclear is the institution's own application: consent is given for it, not asked.
    const grant = details.grantId
      ? await provider.Grant.find(details.grantId)
      : new provider.Grant({ accountId: session.accountId, clientId: params.client_id });
    if (prompt.details.missingOIDCScope) grant.addOIDCScope(prompt.details.missingOIDCScope.join(" "));
    if (prompt.details.missingOIDCClaims) grant.addOIDCClaims(prompt.details.missingOIDCClaims);
    const grantId = await grant.save();
    await provider.interactionFinished(req, res, { consent: { grantId } }, { mergeWithLastSubmission: true });
    return;
  }
  res.writeHead(400, { "content-type": "text/plain" });
  res.end("unexpected interaction");
}

const server = http.createServer(async (req, res) => {
  const match = /^\/interaction\/([\w-]+)(?:\/(login))?$/.exec(new URL(req.url, issuer).pathname);
  if (!match) return callback(req, res);
  try {
    await interaction(req, res, match[1], match[2]);
  } catch (error) {
    if (!res.headersSent) res.writeHead(400, { "content-type": "text/html; charset=utf-8" });
    res.end(page("Sign-in problem", `<p>${escape(error instanceof Error ? error.message : error)}</p>`));
  }
});

server.listen(port, host, () => {
  console.log(
    `local identity provider: ${issuer} (client ${clientId}; redirect ${redirectUris.join(" ")}; after sign-out ${postLogoutRedirectUris.join(" ")})`,
  );
});

// Stop at once: open keep-alive connections must not hold the process (the scripts stop it by signal).
for (const signal of ["SIGINT", "SIGTERM"]) {
  process.on(signal, () => {
    server.closeAllConnections();
    server.close(() => process.exit(0));
  });
}
