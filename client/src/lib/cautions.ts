/** Shown wherever an engineer records or judges work on an aircraft. */
export const SAFETY_CAUTION = "Follow the manufacturer's current data and the authority's rules. Wingstage records the work; only the licensed inspector certifies the aircraft.";
