import { adminOnly, everyone, signedIn, type MatrixRow } from "../matrix-kit";

// Accounts: sessions, invitations, passwords, admin user management, and the first pages.
export const ACCOUNT_ROWS: MatrixRow[] = [
  // Sessions and invitations (public by nature; they answer the same whoever asks).
  {
    route: "/api/session",
    method: "POST",
    body: (c) => ({ email: `${c.unique}@example.test`, password: "wrong password" }),
    expect: everyone(401),
  },
  { route: "/api/session", method: "DELETE", expect: everyone(200), freshSession: true },
  {
    route: "/api/invitations/accept",
    method: "POST",
    body: () => ({ token: "x".repeat(43), password: "a long enough passphrase" }),
    expect: everyone(404),
  },
  {
    route: "/api/me/password",
    method: "POST",
    body: () => ({ currentPassword: "not the current one", newPassword: "a long enough passphrase" }),
    expect: signedIn(422, 401),
  },
  // Admin.
  { route: "/api/admin/users", method: "GET", expect: adminOnly(200, 401, 403) },
  {
    route: "/api/admin/users/[id]",
    method: "PATCH",
    path: (c) => `/api/admin/users/${c.targetUserId}`,
    body: () => ({ roles: ["instructor"] }),
    expect: adminOnly(200, 401, 403),
  },
  { route: "/api/admin/invitations", method: "GET", expect: adminOnly(200, 401, 403) },
  {
    route: "/api/admin/invitations",
    method: "POST",
    body: (c) => ({
      email: `${c.unique}@example.test`,
      name: "Matrix Invitee",
      roles: ["instructor"],
      departmentId: null,
    }),
    expect: adminOnly(201, 401, 403),
  },
  // Pages.
  // A responder's account lands on the live sheet, the one page it may see.
  { route: "/", method: "PAGE", expect: { ...signedIn(200, "→/sign-in"), responder: "→/live" } },
  { route: "/sign-in", method: "PAGE", expect: signedIn("→/", 200) },
  {
    route: "/invite/[token]",
    method: "PAGE",
    path: () => `/invite/${"y".repeat(43)}`,
    expect: everyone(200),
  },
  { route: "/account", method: "PAGE", expect: signedIn(200, "→/sign-in") },
  // the list of publications behind the hazard engine's thresholds (issue 12)
  { route: "/references", method: "PAGE", expect: signedIn(200, "→/sign-in") },
  { route: "/forbidden", method: "PAGE", expect: { ...signedIn(200, "→/sign-in"), responder: 200 } },
  { route: "/admin/users", method: "PAGE", expect: adminOnly(200, "→/sign-in", "→/forbidden") },
  // The hazard engine over HTTP: any signed-in user.
  {
    route: "/api/assess",
    method: "POST",
    body: () => ({ sources: [{ kind: "capacitor", capacitance_F: 1e-6, voltage_V: 1000 }] }),
    expect: signedIn(200, 401),
  },
];
