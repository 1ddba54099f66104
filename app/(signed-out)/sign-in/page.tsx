import type { Metadata } from "next";
import { safeNextPath } from "@/domain/crew/next-path";
import { appOrigin } from "@/app/_lib/auth";
import { SignInForm } from "./_components/sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const { next } = await searchParams;
  const safeNext = safeNextPath(next, appOrigin());
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center gap-6 p-6">
      <div>
        <p className="text-3xl font-bold text-brand">Beadline</p>
        <h1 className="mt-2 text-xl font-semibold">Sign in to the fusion-joint log</h1>
      </div>
      <div className="rounded-lg border-2 border-slate-300 bg-white p-6 shadow-sm">
        <SignInForm next={safeNext} />
      </div>
    </main>
  );
}
