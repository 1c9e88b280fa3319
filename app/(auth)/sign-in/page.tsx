import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { Alert } from "@/app/_components/alert";
import { InstitutionSignIn } from "@/app/_components/auth/institution-sign-in";
import { getCurrentUser } from "@/lib/auth/guards";
import { returnPathSchema } from "@/lib/auth/schemas";
import { signInMethods } from "@/lib/auth/sign-in-methods";
import { SSO_REFUSALS } from "@/lib/auth/sso-messages";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

/** What a failed institutional sign-in came back with (lib/auth/sso.ts reasons, or Auth.js's). */
function errorMessage(code: string | undefined): string | null {
  if (!code) return null;
  if (code in SSO_REFUSALS) return SSO_REFUSALS[code as keyof typeof SSO_REFUSALS];
  return "Signing in through your institution did not complete. Try again; if it keeps failing, ask your Benchclear admin.";
}

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<{ from?: string | string[]; error?: string | string[] }>;
}) {
  const { from, error } = await searchParams;
  const returnTo = returnPathSchema.parse(typeof from === "string" ? from : undefined);
  if (await getCurrentUser()) redirect(returnTo);
  const methods = signInMethods();
  const problem = errorMessage(typeof error === "string" ? error.slice(0, 40) : undefined);
  return (
    <div className="rounded-xl border border-stone-200 bg-white p-6 shadow-sm sm:p-8">
      <h1 className="text-xl font-semibold text-stone-900">Sign in to Benchclear</h1>
      <p className="mt-1 text-sm text-stone-600">Hazard assessments, reviews and permits for high-voltage set-ups.</p>
      {problem && (
        <Alert tone="error" className="mt-4">
          {problem}
        </Alert>
      )}
      {methods.institution && (
        <div className="mt-6">
          <InstitutionSignIn name={methods.institution.name} from={returnTo} />
        </div>
      )}
      {methods.institution && methods.password && (
        <p className="mt-6 flex items-center gap-3 text-xs text-stone-500 before:h-px before:flex-1 before:bg-stone-200 after:h-px after:flex-1 after:bg-stone-200">
          or with your Benchclear password
        </p>
      )}
      {methods.password && <SignInForm from={returnTo} />}
    </div>
  );
}
