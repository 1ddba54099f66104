import Link from "next/link";
import { requireUser } from "@/app/_lib/page-guard";
import { Cautions } from "@/components/ui/caution";
import { latestCoilCode, listKnownManufacturers } from "@/database/queries/coils";
import { PE_MATERIALS, nextCoilCode } from "@/domain/coils/life";
import { ReceiveCoilForm } from "../_components/receive-coil-form";

export const dynamic = "force-dynamic";

// Receive a coil: clerk or admin. The form fills from the F2897 code and shows the inspection verdict.
export default async function ReceiveCoilPage() {
  const user = await requireUser("receiveCoils");
  const [latest, manufacturers] = await Promise.all([latestCoilCode(), listKnownManufacturers()]);
  return (
    <div className="flex max-w-3xl flex-col gap-4">
      <p>
        <Link href="/coils" className="font-semibold text-brand underline">
          ← All coils
        </Link>
      </p>
      <h1 className="text-2xl font-bold">Receive a coil</h1>
      <Cautions kinds={["coil"]} title="Handling coils" />
      <ReceiveCoilForm suggestedCode={nextCoilCode(latest)} manufacturers={manufacturers} materials={PE_MATERIALS} unitSystem={user.unitSystem} />
    </div>
  );
}
