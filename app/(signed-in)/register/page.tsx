import { requireUser } from "@/app/_lib/page-guard";
import { registerFilterOptions } from "@/app/_server/reference/register-filter-options";
import { registerViewSchema, type RegisterView } from "@/domain/register";
import { fieldErrorsFromIssues } from "@/domain/result";
import { RegisterScreen } from "./_components/register-screen";

export const dynamic = "force-dynamic";

// Register: every joint, filtered, sorted and searched on the server; the view lives in the URL.
export default async function RegisterPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("viewRegister");
  const raw = await searchParams;
  const flat = Object.fromEntries(Object.entries(raw).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const parsed = registerViewSchema.safeParse(flat);
  const view: RegisterView = parsed.success ? parsed.data : { sort: "madeAt", dir: "desc" };
  const urlErrors = parsed.success ? {} : fieldErrorsFromIssues(parsed.error.issues);
  const options = await registerFilterOptions();
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Register</h1>
      <RegisterScreen view={view} urlErrors={urlErrors} options={options} unitSystem={user.unitSystem} />
    </div>
  );
}
