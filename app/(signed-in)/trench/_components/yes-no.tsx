"use client";
// A yes/no question with two large radio buttons (gloved hands), its error tied to it.
import { ChoiceGroup } from "@/components/form/controls";

export function YesNo({ name, question, value, onChange, error }: { name: string; question: string; value: boolean | undefined | null; onChange: (value: boolean) => void; error?: string }) {
  const option = (answer: boolean, text: string) => {
    const checked = value === answer;
    return (
      <label
        className={`flex min-h-touch flex-1 cursor-pointer items-center justify-center gap-2 rounded-md border-2 px-3 font-semibold ${checked ? (answer ? "border-pass bg-pass-light text-pass" : "border-fail bg-fail-light text-fail") : "border-slate-400 bg-white text-ink"}`}
      >
        <input type="radio" name={name} className="h-5 w-5" checked={checked} onChange={() => onChange(answer)} aria-describedby={error ? `${name}-error` : undefined} />
        {text}
      </label>
    );
  };
  return (
    <ChoiceGroup id={name} legend={question} error={error} options="fill">
      {option(true, "Yes")}
      {option(false, "No")}
    </ChoiceGroup>
  );
}
