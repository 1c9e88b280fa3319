import type { MatrixRow } from "../matrix-kit";
import { adminOnly } from "../matrix-kit";

// Issue 18: where high voltage is live today (/live and its one-page PDF) for safety officers and the
// responder's account, and the emergency contacts the sheet prints (admins). The responder is named
// only here (and on "/" and "/forbidden"); every other row refuses it (matrix-kit responderExpectation).

const liveReaders = {
  anonymous: "→/sign-in",
  instructor: "→/forbidden",
  reviewer: "→/forbidden",
  safety_officer: 200,
  admin: "→/forbidden",
  responder: 200,
} as const;

export const LIVE_REPORT_ROWS: MatrixRow[] = [
  { route: "/live", method: "PAGE", expect: liveReaders },
  { route: "/live/pdf", method: "GET", expect: liveReaders },
  { route: "/api/admin/emergency-contacts", method: "GET", expect: adminOnly(200, 401, 403) },
  // An empty list is refused (422) after the permission check: the institution's contacts stay as
  // they are while the matrix proves who may change them.
  {
    route: "/api/admin/emergency-contacts",
    method: "PUT",
    body: () => ({ contacts: [] }),
    expect: adminOnly(422, 401, 403),
  },
];
