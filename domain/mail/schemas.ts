// What a person sends to choose how their alerts are grouped (the Notifications screen).
import { z } from "zod";
import { MAIL_GROUPINGS } from "@/domain/mail/grouping";

/** Anyone signed in: alerts as they happen, once an hour or once a day. */
export const mailGroupingSchema = z.object({
  grouping: z.enum(MAIL_GROUPINGS, { error: "Alert mail for me: choose as they happen, hourly or daily" }),
});
