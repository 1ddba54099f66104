import { textWithLinks } from "@/domain/mail/links";

/** A mail's plain text as sent, its addresses into Beadline as links that open here. */
export function MailText({ text, base }: { text: string; base: string }) {
  return (
    <pre className="whitespace-pre-wrap break-words font-sans text-sm">
      {textWithLinks(text, base).map((part, i) =>
        "href" in part ? (
          <a key={i} href={part.href} className="break-all font-semibold text-brand underline">
            {part.text}
          </a>
        ) : (
          <span key={i}>{part.text}</span>
        ),
      )}
    </pre>
  );
}
