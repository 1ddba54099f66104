// The asset tag and description every piece of equipment carries (machines and heater
// plates alike), with their ids prefixed per form so two forms on one page never clash.
import type { UseFormRegisterReturn } from "react-hook-form";
import { Field } from "@/components/form/field";

export function AssetFields({ prefix, tag, description, errors }: { prefix: string; tag: UseFormRegisterReturn; description: UseFormRegisterReturn; errors: { assetTag?: string; description?: string } }) {
  return (
    <>
      <Field id={`${prefix}-tag`} label="Asset tag" {...tag} error={errors.assetTag} />
      <Field id={`${prefix}-description`} label="Description" {...description} error={errors.description} />
    </>
  );
}
