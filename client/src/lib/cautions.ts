/** Shown wherever an engineer records or judges work on an aircraft. */
export const SAFETY_CAUTION = "Follow the manufacturer's current data and the authority's rules; only an authorised inspector certifies the aircraft.";
