-- No technician can be booked into two overlapping visits. Canceled and no-show visits free the time.
ALTER TABLE "visits" ADD CONSTRAINT "visits_no_overlap"
  EXCLUDE USING gist ("technician_id" WITH =, tstzrange("starts_at", "ends_at", '[)') WITH &&)
  WHERE ("technician_id" IS NOT NULL AND "status" NOT IN ('canceled', 'no_show'));
