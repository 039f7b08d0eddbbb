-- A case copies its delivery's reference, farm and time of receipt, which case lists search and sort
-- by; existing cases take them from their delivery before the columns become required.
ALTER TABLE "delivery" ADD CONSTRAINT "delivery_case_facts_unique" UNIQUE("id","reference","farm_id","received_at");--> statement-breakpoint
ALTER TABLE "dispute_case" ADD COLUMN "delivery_reference" text;--> statement-breakpoint
ALTER TABLE "dispute_case" ADD COLUMN "farm_id" uuid;--> statement-breakpoint
ALTER TABLE "dispute_case" ADD COLUMN "delivered_at" timestamp with time zone;--> statement-breakpoint
UPDATE "dispute_case" SET "delivery_reference" = d."reference", "farm_id" = d."farm_id", "delivered_at" = d."received_at" FROM "delivery" d WHERE d."id" = "dispute_case"."delivery_id";--> statement-breakpoint
ALTER TABLE "dispute_case" ALTER COLUMN "delivery_reference" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "dispute_case" ALTER COLUMN "farm_id" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "dispute_case" ALTER COLUMN "delivered_at" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "dispute_case" ADD CONSTRAINT "dispute_case_farm_id_supplier_farm_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."supplier_farm"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_case" ADD CONSTRAINT "dispute_case_delivery_facts_fk" FOREIGN KEY ("delivery_id","delivery_reference","farm_id","delivered_at") REFERENCES "public"."delivery"("id","reference","farm_id","received_at") ON DELETE no action ON UPDATE no action;
