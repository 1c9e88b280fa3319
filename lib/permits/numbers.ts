import crypto from "node:crypto";

// Permit numbers and verification codes. The number is for people (HV-2026-0042: the institution's
// prefix, the year, sequential per year); the verification code is for the QR code and the public page (256 random bits, base64url),
// so knowing one permit's number or code tells nothing about another's.

export function formatPermitNumber(prefix: string, year: number, seq: number): string {
  return `${prefix}-${year}-${String(seq).padStart(4, "0")}`;
}

/** 32 random bytes (256 bits, above security.md's 128-bit floor) as 43 base64url characters. */
export function newVerificationCode(): string {
  return crypto.randomBytes(32).toString("base64url");
}
