-- Photos record their downscaled copy (thumb_key, unused until now), the failed tries to make
-- it, and the original's SHA-256, so the evidence pack knows which photos have a copy without
-- probing storage and prints each original's hash. Photos stored before this have neither: the
-- app makes their copies and hashes in the background at start (thumbs-backfill.ts), and
-- `npm run photos:thumbs` does it at once.
ALTER TABLE "attachment" ADD COLUMN "thumb_tries" smallint DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "attachment" ADD COLUMN "sha256" text;--> statement-breakpoint
-- What the background backfill still has to do, found without reading every photo row.
CREATE INDEX "attachment_needs_copy_idx" ON "attachment" USING btree ("id") WHERE (thumb_key is null or sha256 is null) and thumb_tries < 3;--> statement-breakpoint
DO $$
DECLARE
	n_waiting integer;
	n_odd integer;
BEGIN
	SELECT count(*) FILTER (WHERE thumb_key IS NULL),
		count(*) FILTER (WHERE thumb_key IS NOT NULL AND thumb_key <> regexp_replace(storage_key, '\.[a-z0-9]{1,5}$', '.thumb'))
	INTO n_waiting, n_odd FROM attachment;
	IF n_waiting > 0 THEN
		RAISE NOTICE '0016_photo_copies: % photos have no recorded copy yet; the app makes them in the background at start (or run npm run photos:thumbs)', n_waiting;
	END IF;
	-- thumb_key was never written by Benchcall before this: report anything that did.
	IF n_odd > 0 THEN
		RAISE NOTICE '0016_photo_copies: % photos have a thumb_key that is not <photo>.thumb (kept; the pack reads it as the copy)', n_odd;
	END IF;
END;
$$;
