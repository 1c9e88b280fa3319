import type { Metadata } from "next";
import { Alert } from "@/app/_components/alert";
import { findOpenInvitation } from "@/lib/users/actions";
import { AcceptInviteForm } from "./accept-invite-form";

export const metadata: Metadata = { title: "Accept invitation", robots: { index: false } };

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const invitation = token.length >= 20 && token.length <= 200 ? await findOpenInvitation(token) : null;
  return (
    <div className="rounded-xl border border-stone-200 bg-white p-6 shadow-sm sm:p-8">
      <h1 className="text-xl font-semibold text-stone-900">Set your password</h1>
      {invitation ? (
        <>
          <p className="mt-1 text-sm text-stone-600">
            Welcome, {invitation.name}. Choose a password for <span className="font-medium">{invitation.email}</span>.
            Use at least 12 characters; a short sentence works well.
          </p>
          <AcceptInviteForm token={token} />
        </>
      ) : (
        <Alert tone="warn" className="mt-4">
          This invitation link is not valid any more: it was used, replaced or has expired. Ask your Benchclear admin
          for a new one.
        </Alert>
      )}
    </div>
  );
}
