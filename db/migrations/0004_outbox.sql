ALTER TABLE "outgoing_mail" ADD COLUMN "content" jsonb;--> statement-breakpoint
ALTER TABLE "outgoing_mail" ADD COLUMN "claimed_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "outgoing_mail" ADD COLUMN "queue_order" bigserial NOT NULL;