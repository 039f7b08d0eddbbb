ALTER TABLE "outgoing_mail" ADD COLUMN "html" text;--> statement-breakpoint
ALTER TABLE "outgoing_mail" ADD COLUMN "text" text;--> statement-breakpoint
ALTER TABLE "outgoing_mail" ADD COLUMN "has_attachments" boolean DEFAULT false NOT NULL;