// How far ahead and back dates may reach, shared by the schemas, the server's range checks and the
// pages' date fields (which import this without zod).

/** Homeowners and the office book at most this far ahead (months). */
export const BOOKING_HORIZON_MONTHS = 12;
/** The dispatch board and schedules show at most this far from today, either way (years). */
export const BOARD_RANGE_YEARS = 2;
/** A reminder campaign is scheduled at most this far ahead (months), as far as booking opens. */
export const CAMPAIGN_SCHEDULE_MONTHS = BOOKING_HORIZON_MONTHS;
