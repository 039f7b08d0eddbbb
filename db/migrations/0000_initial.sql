CREATE TABLE "invitation" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"organisation_id" uuid NOT NULL,
	"role" text NOT NULL,
	"token_hash" text NOT NULL,
	"invited_by" text NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"accepted_at" timestamp with time zone,
	"revoked_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "invitation_token_hash_unique" UNIQUE("token_hash"),
	CONSTRAINT "invitation_role_check" CHECK ("invitation"."role" in ('supplier', 'plant', 'lab', 'arbiter', 'admin'))
);
--> statement-breakpoint
CREATE TABLE "organisation" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"kind" text NOT NULL,
	"contact_email" text,
	"address" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "organisation_name_unique" UNIQUE("name"),
	CONSTRAINT "organisation_kind_check" CHECK ("organisation"."kind" in ('plant', 'supplier', 'lab', 'board'))
);
--> statement-breakpoint
CREATE TABLE "supplier_farm" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"organisation_id" uuid NOT NULL,
	"name" text NOT NULL,
	"herd_code" text NOT NULL,
	"contact_email" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "supplier_farm_herd_code_unique" UNIQUE("herd_code")
);
--> statement-breakpoint
CREATE TABLE "account" (
	"id" text PRIMARY KEY NOT NULL,
	"account_id" text NOT NULL,
	"provider_id" text NOT NULL,
	"user_id" text NOT NULL,
	"access_token" text,
	"refresh_token" text,
	"id_token" text,
	"access_token_expires_at" timestamp with time zone,
	"refresh_token_expires_at" timestamp with time zone,
	"scope" text,
	"password" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "rate_limit" (
	"id" text PRIMARY KEY NOT NULL,
	"key" text NOT NULL,
	"count" integer NOT NULL,
	"last_request" bigint NOT NULL,
	CONSTRAINT "rate_limit_key_unique" UNIQUE("key")
);
--> statement-breakpoint
CREATE TABLE "session" (
	"id" text PRIMARY KEY NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"token" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"ip_address" text,
	"user_agent" text,
	"user_id" text NOT NULL,
	"impersonated_by" text,
	CONSTRAINT "session_token_unique" UNIQUE("token")
);
--> statement-breakpoint
CREATE TABLE "user" (
	"id" text PRIMARY KEY NOT NULL,
	"name" text NOT NULL,
	"email" text NOT NULL,
	"email_verified" boolean DEFAULT false NOT NULL,
	"image" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"role" text DEFAULT 'supplier' NOT NULL,
	"banned" boolean DEFAULT false,
	"ban_reason" text,
	"ban_expires" timestamp with time zone,
	"organisation_id" uuid NOT NULL,
	CONSTRAINT "user_email_unique" UNIQUE("email")
);
--> statement-breakpoint
CREATE TABLE "verification" (
	"id" text PRIMARY KEY NOT NULL,
	"identifier" text NOT NULL,
	"value" text NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "scheme_rules" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"version" integer NOT NULL,
	"effective_from" timestamp with time zone NOT NULL,
	"rules" jsonb NOT NULL,
	"note" text,
	"created_by" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "scheme_rules_version_unique" UNIQUE("version")
);
--> statement-breakpoint
CREATE TABLE "calibration_check" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"instrument_id" uuid NOT NULL,
	"checked_at" timestamp with time zone NOT NULL,
	"checked_by" text,
	"analyst_name" text NOT NULL,
	"nominal_tenth_milli_c" integer NOT NULL,
	"readings_tenth_milli_c" integer[] NOT NULL,
	"tolerance_tenth_milli_c" integer NOT NULL,
	"required" integer NOT NULL,
	"within" integer NOT NULL,
	"pass" boolean NOT NULL,
	"valid_until" timestamp with time zone NOT NULL,
	"rules_version_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "calibration_nominal_range" CHECK ("calibration_check"."nominal_tenth_milli_c" between -10000 and 0),
	CONSTRAINT "calibration_readings_range" CHECK (cardinality("calibration_check"."readings_tenth_milli_c") > 0 and -10000 <= all("calibration_check"."readings_tenth_milli_c") and 0 >= all("calibration_check"."readings_tenth_milli_c")),
	CONSTRAINT "calibration_tolerance_positive" CHECK ("calibration_check"."tolerance_tenth_milli_c" > 0)
);
--> statement-breakpoint
CREATE TABLE "instrument" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"organisation_id" uuid NOT NULL,
	"serial_number" text NOT NULL,
	"description" text NOT NULL,
	"method" text DEFAULT 'Thermistor cryoscope, ISO 5764 | IDF 108' NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "instrument_serial_unique" UNIQUE("organisation_id","serial_number")
);
--> statement-breakpoint
CREATE TABLE "delivery" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"reference" text NOT NULL,
	"plant_organisation_id" uuid NOT NULL,
	"supplier_organisation_id" uuid NOT NULL,
	"farm_id" uuid NOT NULL,
	"collected_at" timestamp with time zone NOT NULL,
	"received_at" timestamp with time zone NOT NULL,
	"volume_litres" integer NOT NULL,
	"tanker" text NOT NULL,
	"compartment" text NOT NULL,
	"receipt_temp_tenth_milli_c" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "delivery_reference_unique" UNIQUE("reference"),
	CONSTRAINT "delivery_volume_positive" CHECK ("delivery"."volume_litres" > 0),
	CONSTRAINT "delivery_received_after_collected" CHECK ("delivery"."received_at" >= "delivery"."collected_at"),
	CONSTRAINT "delivery_receipt_temp_range" CHECK ("delivery"."receipt_temp_tenth_milli_c" between -20000 and 400000)
);
--> statement-breakpoint
CREATE TABLE "custody_event" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"sample_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"at" timestamp with time zone NOT NULL,
	"actor_user_id" text,
	"organisation_id" uuid NOT NULL,
	"location" text,
	"temp_tenth_milli_c" integer,
	"seal_intact" boolean,
	"frozen" boolean,
	"note" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "custody_event_kind_check" CHECK ("custody_event"."kind" in ('sealed', 'stored', 'dispatched', 'received', 'seal_checked', 'opened', 'disposed')),
	CONSTRAINT "custody_event_temp_range" CHECK ("custody_event"."temp_tenth_milli_c" is null or "custody_event"."temp_tenth_milli_c" between -300000 and 500000)
);
--> statement-breakpoint
CREATE TABLE "sample" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"delivery_id" uuid NOT NULL,
	"case_id" uuid,
	"code" text NOT NULL,
	"kind" text NOT NULL,
	"seal_number" text,
	"preservative" text,
	"storage" text,
	"sampled_at" timestamp with time zone NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sample_code_unique" UNIQUE("code"),
	CONSTRAINT "sample_kind_check" CHECK ("sample"."kind" in ('routine', 'retained', 'counter', 'referee', 'authentic'))
);
--> statement-breakpoint
CREATE TABLE "measurement_set" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"sample_id" uuid NOT NULL,
	"case_id" uuid,
	"organisation_id" uuid NOT NULL,
	"instrument_id" uuid NOT NULL,
	"calibration_check_id" uuid,
	"purpose" text NOT NULL,
	"analyst_name" text NOT NULL,
	"tested_at" timestamp with time zone NOT NULL,
	"sample_temp_tenth_milli_c" integer,
	"preparation" text DEFAULT 'none' NOT NULL,
	"result_tenth_milli_c" integer,
	"result_basis" text,
	"readings_used" integer,
	"created_by" text,
	"submitted_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "measurement_purpose_check" CHECK ("measurement_set"."purpose" in ('intake', 'retest', 'further_test')),
	CONSTRAINT "measurement_preparation_check" CHECK ("measurement_set"."preparation" in ('none', 'prewarmed')),
	CONSTRAINT "measurement_result_range" CHECK ("measurement_set"."result_tenth_milli_c" is null or "measurement_set"."result_tenth_milli_c" between -10000 and 0),
	CONSTRAINT "measurement_result_basis_check" CHECK ("measurement_set"."result_basis" is null or "measurement_set"."result_basis" in ('mean_of_2', 'mean_of_4', 'median_of_4'))
);
--> statement-breakpoint
CREATE TABLE "reading" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"measurement_set_id" uuid NOT NULL,
	"position" integer NOT NULL,
	"value_tenth_milli_c" integer NOT NULL,
	"flag" text DEFAULT 'none' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "reading_position_unique" UNIQUE("measurement_set_id","position"),
	CONSTRAINT "reading_value_range" CHECK ("reading"."value_tenth_milli_c" between -10000 and 0),
	CONSTRAINT "reading_position_positive" CHECK ("reading"."position" >= 1),
	CONSTRAINT "reading_flag_check" CHECK ("reading"."flag" in ('none', 'early_crystallisation', 'no_crystallisation'))
);
--> statement-breakpoint
CREATE TABLE "intake_result" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"delivery_id" uuid NOT NULL,
	"measurement_set_id" uuid NOT NULL,
	"rules_version_id" uuid NOT NULL,
	"value_tenth_milli_c" integer NOT NULL,
	"limit_tenth_milli_c" integer NOT NULL,
	"decision_rule" text NOT NULL,
	"verdict" text NOT NULL,
	"added_water_basis_points" integer DEFAULT 0 NOT NULL,
	"amount_minor" integer DEFAULT 0 NOT NULL,
	"currency" text NOT NULL,
	"decided_by" text,
	"decided_at" timestamp with time zone NOT NULL,
	"notified_at" timestamp with time zone,
	"supersedes_id" uuid,
	"superseded_at" timestamp with time zone,
	"correction_reason" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "intake_verdict_check" CHECK ("intake_result"."verdict" in ('accepted', 'deducted', 'rejected')),
	CONSTRAINT "intake_value_range" CHECK ("intake_result"."value_tenth_milli_c" between -10000 and 0),
	CONSTRAINT "intake_amount_nonnegative" CHECK ("intake_result"."amount_minor" >= 0),
	CONSTRAINT "intake_correction_has_reason" CHECK ("intake_result"."supersedes_id" is null or "intake_result"."correction_reason" is not null)
);
--> statement-breakpoint
CREATE TABLE "dispute_case" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"number" text NOT NULL,
	"year" integer NOT NULL,
	"sequence" integer NOT NULL,
	"delivery_id" uuid NOT NULL,
	"intake_result_id" uuid NOT NULL,
	"supplier_organisation_id" uuid NOT NULL,
	"plant_organisation_id" uuid NOT NULL,
	"lab_organisation_id" uuid,
	"board_organisation_id" uuid NOT NULL,
	"rules_version_id" uuid NOT NULL,
	"status" text DEFAULT 'open' NOT NULL,
	"grounds" text[] NOT NULL,
	"explanation" text NOT NULL,
	"remedy" text NOT NULL,
	"opened_by" text NOT NULL,
	"opened_at" timestamp with time zone DEFAULT now() NOT NULL,
	"dispatch_due_at" timestamp with time zone,
	"sample_valid_until" timestamp with time zone,
	"retest_submitted_at" timestamp with time zone,
	"decision_due_at" timestamp with time zone,
	"decided_at" timestamp with time zone,
	"withdrawn_at" timestamp with time zone,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "dispute_case_number_unique" UNIQUE("number"),
	CONSTRAINT "dispute_case_status_check" CHECK ("dispute_case"."status" in ('open', 'awaiting_sample', 'retest', 'review', 'decided', 'withdrawn')),
	CONSTRAINT "dispute_case_grounds_present" CHECK (cardinality("dispute_case"."grounds") > 0),
	CONSTRAINT "dispute_case_number_format" CHECK ("dispute_case"."number" ~ '^CS-[0-9]{4}-[0-9]{4,}$')
);
--> statement-breakpoint
CREATE TABLE "reminder_sent" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"case_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"due_at" timestamp with time zone NOT NULL,
	"sent_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "attachment" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"case_id" uuid NOT NULL,
	"uploaded_by" text NOT NULL,
	"organisation_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"caption" text,
	"file_name" text NOT NULL,
	"content_type" text NOT NULL,
	"size_bytes" bigint NOT NULL,
	"sha256" text NOT NULL,
	"storage_key" text NOT NULL,
	"url" text NOT NULL,
	"thumbnail_key" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"removed_at" timestamp with time zone,
	"removed_by" text,
	CONSTRAINT "attachment_storage_key_unique" UNIQUE("storage_key"),
	CONSTRAINT "attachment_kind_check" CHECK ("attachment"."kind" in ('lab_sheet', 'photo', 'calibration_certificate', 'correspondence', 'other')),
	CONSTRAINT "attachment_sha256_format" CHECK ("attachment"."sha256" ~ '^[0-9a-f]{64}$'),
	CONSTRAINT "attachment_size_positive" CHECK ("attachment"."size_bytes" > 0)
);
--> statement-breakpoint
CREATE TABLE "note" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"case_id" uuid NOT NULL,
	"parent_id" uuid,
	"author_user_id" text NOT NULL,
	"organisation_id" uuid NOT NULL,
	"visibility" text NOT NULL,
	"body" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"edited_at" timestamp with time zone,
	CONSTRAINT "note_visibility_check" CHECK ("note"."visibility" in ('parties', 'internal'))
);
--> statement-breakpoint
CREATE TABLE "note_revision" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"note_id" uuid NOT NULL,
	"body" jsonb NOT NULL,
	"replaced_at" timestamp with time zone DEFAULT now() NOT NULL,
	"replaced_by" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "decision" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"case_id" uuid NOT NULL,
	"outcome" text NOT NULL,
	"reasons" text NOT NULL,
	"followed_proposal" boolean NOT NULL,
	"departure_reason" text,
	"proposal" jsonb NOT NULL,
	"settlement" jsonb NOT NULL,
	"signer_user_id" text NOT NULL,
	"signer_name" text NOT NULL,
	"signed_at" timestamp with time zone NOT NULL,
	"signature_meaning" text NOT NULL,
	"reauthenticated_at" timestamp with time zone NOT NULL,
	"reauthentication_method" text NOT NULL,
	"record_sha256" text,
	"record_signature" text,
	"signing_key_id" text,
	"supersedes_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "decision_outcome_check" CHECK ("decision"."outcome" in ('uphold', 'reverse', 'adjust', 'further_test')),
	CONSTRAINT "decision_departure_has_reason" CHECK ("decision"."followed_proposal" or "decision"."departure_reason" is not null)
);
--> statement-breakpoint
CREATE TABLE "audit_event" (
	"seq" bigserial PRIMARY KEY NOT NULL,
	"at" timestamp with time zone NOT NULL,
	"actor_user_id" text,
	"actor_organisation_id" uuid,
	"action" text NOT NULL,
	"object_type" text NOT NULL,
	"object_id" text NOT NULL,
	"case_id" uuid,
	"change" jsonb NOT NULL,
	"origin" text,
	"prev_hash" text NOT NULL,
	"hash" text NOT NULL,
	CONSTRAINT "audit_event_hash_unique" UNIQUE("hash")
);
--> statement-breakpoint
CREATE TABLE "outgoing_mail" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"to" text[] NOT NULL,
	"subject" text NOT NULL,
	"template" text NOT NULL,
	"case_id" uuid,
	"status" text DEFAULT 'queued' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_error" text,
	"message_id" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sent_at" timestamp with time zone,
	CONSTRAINT "outgoing_mail_status_check" CHECK ("outgoing_mail"."status" in ('queued', 'sent', 'failed'))
);
--> statement-breakpoint
ALTER TABLE "invitation" ADD CONSTRAINT "invitation_organisation_id_organisation_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "supplier_farm" ADD CONSTRAINT "supplier_farm_organisation_id_organisation_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "account" ADD CONSTRAINT "account_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "session" ADD CONSTRAINT "session_user_id_user_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."user"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "user" ADD CONSTRAINT "user_organisation_id_organisation_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibration_check" ADD CONSTRAINT "calibration_check_instrument_id_instrument_id_fk" FOREIGN KEY ("instrument_id") REFERENCES "public"."instrument"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibration_check" ADD CONSTRAINT "calibration_check_checked_by_user_id_fk" FOREIGN KEY ("checked_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calibration_check" ADD CONSTRAINT "calibration_check_rules_version_id_scheme_rules_id_fk" FOREIGN KEY ("rules_version_id") REFERENCES "public"."scheme_rules"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "instrument" ADD CONSTRAINT "instrument_organisation_id_organisation_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "delivery" ADD CONSTRAINT "delivery_plant_organisation_id_organisation_id_fk" FOREIGN KEY ("plant_organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "delivery" ADD CONSTRAINT "delivery_supplier_organisation_id_organisation_id_fk" FOREIGN KEY ("supplier_organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "delivery" ADD CONSTRAINT "delivery_farm_id_supplier_farm_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."supplier_farm"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "custody_event" ADD CONSTRAINT "custody_event_sample_id_sample_id_fk" FOREIGN KEY ("sample_id") REFERENCES "public"."sample"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "custody_event" ADD CONSTRAINT "custody_event_actor_user_id_user_id_fk" FOREIGN KEY ("actor_user_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "custody_event" ADD CONSTRAINT "custody_event_organisation_id_organisation_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sample" ADD CONSTRAINT "sample_delivery_id_delivery_id_fk" FOREIGN KEY ("delivery_id") REFERENCES "public"."delivery"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sample" ADD CONSTRAINT "sample_case_id_dispute_case_id_fk" FOREIGN KEY ("case_id") REFERENCES "public"."dispute_case"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "measurement_set" ADD CONSTRAINT "measurement_set_sample_id_sample_id_fk" FOREIGN KEY ("sample_id") REFERENCES "public"."sample"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "measurement_set" ADD CONSTRAINT "measurement_set_case_id_dispute_case_id_fk" FOREIGN KEY ("case_id") REFERENCES "public"."dispute_case"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "measurement_set" ADD CONSTRAINT "measurement_set_organisation_id_organisation_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "measurement_set" ADD CONSTRAINT "measurement_set_instrument_id_instrument_id_fk" FOREIGN KEY ("instrument_id") REFERENCES "public"."instrument"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "measurement_set" ADD CONSTRAINT "measurement_set_calibration_check_id_calibration_check_id_fk" FOREIGN KEY ("calibration_check_id") REFERENCES "public"."calibration_check"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "measurement_set" ADD CONSTRAINT "measurement_set_created_by_user_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reading" ADD CONSTRAINT "reading_measurement_set_id_measurement_set_id_fk" FOREIGN KEY ("measurement_set_id") REFERENCES "public"."measurement_set"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "intake_result" ADD CONSTRAINT "intake_result_delivery_id_delivery_id_fk" FOREIGN KEY ("delivery_id") REFERENCES "public"."delivery"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "intake_result" ADD CONSTRAINT "intake_result_measurement_set_id_measurement_set_id_fk" FOREIGN KEY ("measurement_set_id") REFERENCES "public"."measurement_set"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "intake_result" ADD CONSTRAINT "intake_result_rules_version_id_scheme_rules_id_fk" FOREIGN KEY ("rules_version_id") REFERENCES "public"."scheme_rules"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "intake_result" ADD CONSTRAINT "intake_result_decided_by_user_id_fk" FOREIGN KEY ("decided_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "intake_result" ADD CONSTRAINT "intake_result_supersedes_id_intake_result_id_fk" FOREIGN KEY ("supersedes_id") REFERENCES "public"."intake_result"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_case" ADD CONSTRAINT "dispute_case_delivery_id_delivery_id_fk" FOREIGN KEY ("delivery_id") REFERENCES "public"."delivery"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_case" ADD CONSTRAINT "dispute_case_intake_result_id_intake_result_id_fk" FOREIGN KEY ("intake_result_id") REFERENCES "public"."intake_result"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_case" ADD CONSTRAINT "dispute_case_supplier_organisation_id_organisation_id_fk" FOREIGN KEY ("supplier_organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_case" ADD CONSTRAINT "dispute_case_plant_organisation_id_organisation_id_fk" FOREIGN KEY ("plant_organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_case" ADD CONSTRAINT "dispute_case_lab_organisation_id_organisation_id_fk" FOREIGN KEY ("lab_organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_case" ADD CONSTRAINT "dispute_case_board_organisation_id_organisation_id_fk" FOREIGN KEY ("board_organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_case" ADD CONSTRAINT "dispute_case_rules_version_id_scheme_rules_id_fk" FOREIGN KEY ("rules_version_id") REFERENCES "public"."scheme_rules"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dispute_case" ADD CONSTRAINT "dispute_case_opened_by_user_id_fk" FOREIGN KEY ("opened_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "reminder_sent" ADD CONSTRAINT "reminder_sent_case_id_dispute_case_id_fk" FOREIGN KEY ("case_id") REFERENCES "public"."dispute_case"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_case_id_dispute_case_id_fk" FOREIGN KEY ("case_id") REFERENCES "public"."dispute_case"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_uploaded_by_user_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_organisation_id_organisation_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachment" ADD CONSTRAINT "attachment_removed_by_user_id_fk" FOREIGN KEY ("removed_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "note" ADD CONSTRAINT "note_case_id_dispute_case_id_fk" FOREIGN KEY ("case_id") REFERENCES "public"."dispute_case"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "note" ADD CONSTRAINT "note_parent_id_note_id_fk" FOREIGN KEY ("parent_id") REFERENCES "public"."note"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "note" ADD CONSTRAINT "note_author_user_id_user_id_fk" FOREIGN KEY ("author_user_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "note" ADD CONSTRAINT "note_organisation_id_organisation_id_fk" FOREIGN KEY ("organisation_id") REFERENCES "public"."organisation"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "note_revision" ADD CONSTRAINT "note_revision_note_id_note_id_fk" FOREIGN KEY ("note_id") REFERENCES "public"."note"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "note_revision" ADD CONSTRAINT "note_revision_replaced_by_user_id_fk" FOREIGN KEY ("replaced_by") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision" ADD CONSTRAINT "decision_case_id_dispute_case_id_fk" FOREIGN KEY ("case_id") REFERENCES "public"."dispute_case"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision" ADD CONSTRAINT "decision_signer_user_id_user_id_fk" FOREIGN KEY ("signer_user_id") REFERENCES "public"."user"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "decision" ADD CONSTRAINT "decision_supersedes_id_decision_id_fk" FOREIGN KEY ("supersedes_id") REFERENCES "public"."decision"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "invitation_email_idx" ON "invitation" USING btree ("email");--> statement-breakpoint
CREATE INDEX "supplier_farm_organisation_idx" ON "supplier_farm" USING btree ("organisation_id");--> statement-breakpoint
CREATE INDEX "account_user_idx" ON "account" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "session_user_idx" ON "session" USING btree ("user_id");--> statement-breakpoint
CREATE INDEX "user_organisation_idx" ON "user" USING btree ("organisation_id");--> statement-breakpoint
CREATE INDEX "verification_identifier_idx" ON "verification" USING btree ("identifier");--> statement-breakpoint
CREATE INDEX "scheme_rules_effective_idx" ON "scheme_rules" USING btree ("effective_from");--> statement-breakpoint
CREATE INDEX "calibration_check_instrument_idx" ON "calibration_check" USING btree ("instrument_id","checked_at");--> statement-breakpoint
CREATE INDEX "delivery_supplier_received_idx" ON "delivery" USING btree ("supplier_organisation_id","received_at");--> statement-breakpoint
CREATE INDEX "delivery_plant_received_idx" ON "delivery" USING btree ("plant_organisation_id","received_at");--> statement-breakpoint
CREATE INDEX "delivery_farm_received_idx" ON "delivery" USING btree ("farm_id","received_at");--> statement-breakpoint
CREATE INDEX "custody_event_sample_idx" ON "custody_event" USING btree ("sample_id","at");--> statement-breakpoint
CREATE INDEX "sample_delivery_idx" ON "sample" USING btree ("delivery_id");--> statement-breakpoint
CREATE INDEX "sample_case_idx" ON "sample" USING btree ("case_id");--> statement-breakpoint
CREATE INDEX "measurement_set_sample_idx" ON "measurement_set" USING btree ("sample_id");--> statement-breakpoint
CREATE INDEX "measurement_set_case_idx" ON "measurement_set" USING btree ("case_id");--> statement-breakpoint
CREATE INDEX "intake_result_delivery_idx" ON "intake_result" USING btree ("delivery_id");--> statement-breakpoint
CREATE INDEX "intake_result_verdict_idx" ON "intake_result" USING btree ("verdict","decided_at");--> statement-breakpoint
CREATE UNIQUE INDEX "dispute_case_year_sequence_unique" ON "dispute_case" USING btree ("year","sequence");--> statement-breakpoint
CREATE UNIQUE INDEX "dispute_case_live_result_unique" ON "dispute_case" USING btree ("intake_result_id") WHERE "dispute_case"."status" <> 'withdrawn';--> statement-breakpoint
CREATE INDEX "dispute_case_supplier_idx" ON "dispute_case" USING btree ("supplier_organisation_id","status");--> statement-breakpoint
CREATE INDEX "dispute_case_plant_idx" ON "dispute_case" USING btree ("plant_organisation_id","status");--> statement-breakpoint
CREATE INDEX "dispute_case_lab_idx" ON "dispute_case" USING btree ("lab_organisation_id","status");--> statement-breakpoint
CREATE INDEX "dispute_case_board_idx" ON "dispute_case" USING btree ("board_organisation_id","status");--> statement-breakpoint
CREATE INDEX "dispute_case_opened_idx" ON "dispute_case" USING btree ("opened_at");--> statement-breakpoint
CREATE UNIQUE INDEX "reminder_sent_unique" ON "reminder_sent" USING btree ("case_id","kind","due_at");--> statement-breakpoint
CREATE INDEX "attachment_case_idx" ON "attachment" USING btree ("case_id","created_at");--> statement-breakpoint
CREATE INDEX "note_case_idx" ON "note" USING btree ("case_id","created_at");--> statement-breakpoint
CREATE INDEX "note_revision_note_idx" ON "note_revision" USING btree ("note_id");--> statement-breakpoint
CREATE INDEX "decision_case_idx" ON "decision" USING btree ("case_id");--> statement-breakpoint
CREATE INDEX "audit_event_case_idx" ON "audit_event" USING btree ("case_id","seq");--> statement-breakpoint
CREATE INDEX "audit_event_object_idx" ON "audit_event" USING btree ("object_type","object_id");--> statement-breakpoint
CREATE INDEX "outgoing_mail_status_idx" ON "outgoing_mail" USING btree ("status","created_at");