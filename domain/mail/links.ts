// Where a mail points its reader: a page the recipient may open, chosen by their role
// (domain/roles). An inspector's joint alert opens the joint in Review; a cut-out notice
// (to the fuser, who may not open Review) and anyone else get the joint's own page, which
// every signed-in person may open. Paths only; the mail text puts the app's public
// address in front, the Notifications screen links them in place.
import { can, type Actor } from "@/domain/roles";

export type MailAbout = { kind: "joint"; jointId: number } | { kind: "cut-out"; jointId: number } | { kind: "qualification"; userId: number } | { kind: "heater"; heaterId: number };

export function mailLinkPath(about: MailAbout, recipient: Pick<Actor, "roles">): string {
  switch (about.kind) {
    case "joint":
      return can(recipient, "viewReview") ? `/review?joint=${about.jointId}` : `/joints/${about.jointId}`;
    case "cut-out":
      // The decision is made; the fuser remakes the joint: its page shows why.
      return `/joints/${about.jointId}`;
    case "qualification":
      // Crew shows the person's qualifications; Today shows a fuser their own.
      return can(recipient, "manageCrew") ? `/crew/${about.userId}` : "/";
    case "heater":
      return can(recipient, "manageEquipment") ? `/equipment/heaters/${about.heaterId}` : "/";
  }
}

export type TextPart = { text: string } | { text: string; href: string };

/**
 * Splits a mail's plain text into text and links, for showing it in the app: an address
 * under `base` (the app's public address) becomes an in-app path, any other http(s)
 * address stays as it is. A trailing full stop or bracket is not part of a link.
 */
export function textWithLinks(text: string, base: string): TextPart[] {
  const parts: TextPart[] = [];
  const re = /https?:\/\/[^\s<>"]+[^\s<>".,;:!?)\]]/g;
  let last = 0;
  for (const m of text.matchAll(re)) {
    const start = m.index ?? 0;
    if (start > last) parts.push({ text: text.slice(last, start) });
    const url = m[0];
    const root = base.replace(/\/+$/, "");
    const inApp = root && (url === root || url.startsWith(`${root}/`) || url.startsWith(`${root}?`));
    parts.push({ text: url, href: inApp ? url.slice(root.length) || "/" : url });
    last = start + url.length;
  }
  if (last < text.length) parts.push({ text: text.slice(last) });
  return parts;
}
