"use client";

import { Alert } from "@/app/_components/alert";
import { Field } from "@/app/_components/field";
import { InstitutionSignIn } from "./institution-sign-in";

// How a signer confirms who they are before a signature (approve, reject, revoke): their Benchclear
// password, or — for people who sign in through the institution's provider — a fresh sign-in there,
// within 5 minutes before signing (lib/signing/password.ts decides; this only shows the way).

export type SigningProps =
  { method: "password" } | { method: "institution"; name: string; fresh: boolean; returnTo: string };

export type SignerCheckProps = {
  signing: SigningProps;
  password: string;
  onPassword: (value: string) => void;
  error?: string;
  hint: string;
};

export function SignerCheck({ signing, password, onPassword, error, hint }: SignerCheckProps) {
  if (signing.method === "password") {
    return (
      <Field
        label="Your password"
        name="password"
        type="password"
        autoComplete="current-password"
        required
        value={password}
        onChange={(e) => onPassword(e.target.value)}
        error={error}
        hint={hint}
      />
    );
  }
  if (signing.fresh) {
    return (
      <Alert tone="success">
        You confirmed who you are through {signing.name}. Sign within 5 minutes of that sign-in.
      </Alert>
    );
  }
  return (
    <div className="flex flex-col gap-2" data-invalid={error ? true : undefined} tabIndex={error ? -1 : undefined}>
      <p className="text-sm text-stone-700">
        Signing needs a fresh sign-in through {signing.name}: confirm it is you, then sign within 5 minutes.
      </p>
      {error && <p className="text-sm font-medium text-red-800">{error}</p>}
      <InstitutionSignIn
        name={signing.name}
        from={signing.returnTo}
        reauth
        variant="secondary"
        label={`Confirm it is you with ${signing.name}`}
      />
    </div>
  );
}
