-- One date and number style per shop: the locale (BCP 47) and time zone (IANA) every date, time
-- and number is written in, and the clock "at 10:30" in a phrase is read on. New columns with
-- defaults: no existing row can break them. The seed sets the zone to the server's own.
ALTER TABLE "shop" ADD COLUMN "locale" text DEFAULT 'en-GB' NOT NULL;--> statement-breakpoint
ALTER TABLE "shop" ADD COLUMN "time_zone" text DEFAULT 'UTC' NOT NULL;
