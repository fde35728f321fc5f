CREATE TABLE "mail_messages" (
	"id" serial PRIMARY KEY NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"envelope_from" text NOT NULL,
	"envelope_to" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"from_header" text NOT NULL,
	"to_header" text NOT NULL,
	"subject" text NOT NULL,
	"message_id" text,
	"text" text,
	"html" text,
	"attachments" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"size" integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE "membrane_alerts" (
	"id" serial PRIMARY KEY NOT NULL,
	"site_id" integer NOT NULL,
	"stage" text NOT NULL,
	"kind" text NOT NULL,
	"crossed_at" timestamp with time zone NOT NULL,
	"detected_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_seen_at" timestamp with time zone DEFAULT now() NOT NULL,
	"cleared_at" timestamp with time zone,
	"change_pct" double precision NOT NULL,
	"threshold_pct" double precision NOT NULL,
	"nightly_run_id" integer,
	CONSTRAINT "membrane_alerts_kind_check" CHECK (kind in ('permeate-flow-drop', 'differential-pressure-rise', 'salt-passage-rise'))
);
--> statement-breakpoint
CREATE TABLE "nightly_runs" (
	"id" serial PRIMARY KEY NOT NULL,
	"started_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone,
	"outcome" text,
	"trigger" text NOT NULL,
	"host" text NOT NULL,
	"pid" integer NOT NULL,
	"inbox" text NOT NULL,
	"report_date" text NOT NULL,
	"files" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"steps" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"figures" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"mail" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"error" text,
	CONSTRAINT "nightly_runs_outcome_check" CHECK (outcome is null or outcome in ('ok', 'partial', 'failed', 'skipped')),
	CONSTRAINT "nightly_runs_trigger_check" CHECK (trigger in ('cli', 'schedule'))
);
--> statement-breakpoint
CREATE TABLE "outbox" (
	"id" serial PRIMARY KEY NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"kind" text NOT NULL,
	"dedupe_key" text NOT NULL,
	"to_address" text NOT NULL,
	"subject" text NOT NULL,
	"text" text NOT NULL,
	"html" text NOT NULL,
	"attachments" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"last_error" text,
	"last_attempt_at" timestamp with time zone,
	"sent_at" timestamp with time zone,
	"message_id" text,
	"nightly_run_id" integer,
	CONSTRAINT "outbox_kind_check" CHECK (kind in ('digest', 'membrane-alert', 'import-failure'))
);
--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "digest" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "membrane_alerts" ADD CONSTRAINT "membrane_alerts_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "membrane_alerts" ADD CONSTRAINT "membrane_alerts_nightly_run_id_nightly_runs_id_fk" FOREIGN KEY ("nightly_run_id") REFERENCES "public"."nightly_runs"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "outbox" ADD CONSTRAINT "outbox_nightly_run_id_nightly_runs_id_fk" FOREIGN KEY ("nightly_run_id") REFERENCES "public"."nightly_runs"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "mail_messages_received_idx" ON "mail_messages" USING btree ("received_at");--> statement-breakpoint
CREATE UNIQUE INDEX "membrane_alerts_open_key" ON "membrane_alerts" USING btree ("site_id","stage","kind") WHERE cleared_at is null;--> statement-breakpoint
CREATE INDEX "membrane_alerts_detected_idx" ON "membrane_alerts" USING btree ("site_id","detected_at");--> statement-breakpoint
CREATE INDEX "nightly_runs_started_idx" ON "nightly_runs" USING btree ("started_at");--> statement-breakpoint
CREATE UNIQUE INDEX "outbox_dedupe_key" ON "outbox" USING btree ("dedupe_key");--> statement-breakpoint
CREATE INDEX "outbox_unsent_idx" ON "outbox" USING btree ("id") WHERE sent_at is null;--> statement-breakpoint
CREATE INDEX "outbox_recipient_idx" ON "outbox" USING btree ("to_address","kind","created_at");