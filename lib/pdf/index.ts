import "server-only";

// The printable permit and bench card: rendering (render.tsx, from a print snapshot), storage by
// snapshot hash (store.ts) and the snapshot itself (data.ts). Callers use these.

export { ensurePermitPdf, getPermitDocument, getPermitDocumentFor, getPermitPdf } from "./store";
export type { PermitFile, StoredPermitPdf } from "./store";
export type { DocumentKind, PaperSize, PrintData } from "./types";
