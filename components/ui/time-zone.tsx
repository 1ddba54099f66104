"use client";
// The organisation's time zone for the client parts of a screen: the signed-in layout
// provides it (read from the database on the server), so server and browser render the
// same text, whatever zone the device itself is set to.
import { createContext, useContext, type ReactNode } from "react";
import { UTC_ZONE } from "@/domain/dates/zone";

const TimeZoneContext = createContext<string>(UTC_ZONE);

export function TimeZoneProvider({ timeZone, children }: { timeZone: string; children: ReactNode }) {
  return <TimeZoneContext.Provider value={timeZone}>{children}</TimeZoneContext.Provider>;
}

/** The organisation's IANA zone (UTC outside a provider). */
export function useTimeZone(): string {
  return useContext(TimeZoneContext);
}
