import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getCurrentUser } from "@/lib/auth/guards";
import { returnPathSchema } from "@/lib/auth/schemas";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ from?: string | string[] }> }) {
  const { from } = await searchParams;
  const returnTo = returnPathSchema.parse(typeof from === "string" ? from : undefined);
  if (await getCurrentUser()) redirect(returnTo);
  return (
    <div className="rounded-xl border border-stone-200 bg-white p-6 shadow-sm sm:p-8">
      <h1 className="text-xl font-semibold text-stone-900">Sign in to Benchclear</h1>
      <p className="mt-1 text-sm text-stone-600">Hazard assessments, reviews and permits for high-voltage set-ups.</p>
      <SignInForm from={returnTo} />
    </div>
  );
}
