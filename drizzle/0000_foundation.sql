CREATE TABLE "assets" (
	"id" serial PRIMARY KEY NOT NULL,
	"site_id" integer NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"kind" text NOT NULL,
	"parent_id" integer,
	"rated_permeate_m3h" double precision,
	"element_capacity" integer,
	"rack_row" integer,
	"rack_col" integer,
	CONSTRAINT "assets_kind_check" CHECK (kind in ('site', 'train', 'stage', 'vessel', 'pump', 'filter', 'instrument', 'other')),
	CONSTRAINT "assets_capacity_check" CHECK (element_capacity is null or element_capacity between 1 and 16),
	CONSTRAINT "assets_vessel_capacity_check" CHECK (kind <> 'vessel' or element_capacity is not null),
	CONSTRAINT "assets_rated_check" CHECK (rated_permeate_m3h is null or rated_permeate_m3h >= 0)
);
--> statement-breakpoint
CREATE TABLE "dirty_hours" (
	"tag_id" integer NOT NULL,
	"from_hour" timestamp with time zone NOT NULL,
	"to_hour" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "downtime_events" (
	"id" serial PRIMARY KEY NOT NULL,
	"asset_id" integer NOT NULL,
	"tag_id" integer NOT NULL,
	"from_ts" timestamp with time zone NOT NULL,
	"to_ts" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "elements" (
	"id" serial PRIMARY KEY NOT NULL,
	"site_id" integer NOT NULL,
	"serial" text NOT NULL,
	"model" text NOT NULL,
	"vessel_id" integer NOT NULL,
	"position" integer NOT NULL,
	"installed_at" timestamp with time zone NOT NULL,
	"removed_at" timestamp with time zone,
	"removal_reason" text,
	"import_id" integer,
	CONSTRAINT "elements_position_check" CHECK (position >= 1),
	CONSTRAINT "elements_removed_check" CHECK (removed_at is null or removed_at > installed_at),
	CONSTRAINT "elements_reason_check" CHECK (removal_reason is null or removal_reason in ('failed', 'performance', 'damaged', 'planned', 'relocated', 'sampled'))
);
--> statement-breakpoint
CREATE TABLE "import_rejects" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"import_id" integer NOT NULL,
	"line" integer NOT NULL,
	"reason" text NOT NULL,
	"raw" text
);
--> statement-breakpoint
CREATE TABLE "imports" (
	"id" serial PRIMARY KEY NOT NULL,
	"site_id" integer,
	"kind" text NOT NULL,
	"file_name" text NOT NULL,
	"sha256" text NOT NULL,
	"actor" text NOT NULL,
	"status" text NOT NULL,
	"rows_read" integer DEFAULT 0 NOT NULL,
	"rows_inserted" integer DEFAULT 0 NOT NULL,
	"rows_unchanged" integer DEFAULT 0 NOT NULL,
	"rows_rejected" integer DEFAULT 0 NOT NULL,
	"duration_ms" integer DEFAULT 0 NOT NULL,
	"options" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"notes" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"error" text,
	"started_at" timestamp with time zone DEFAULT now() NOT NULL,
	"finished_at" timestamp with time zone,
	CONSTRAINT "imports_kind_check" CHECK (kind in ('historian', 'tags', 'assets', 'work-orders', 'elements', 'job-steps')),
	CONSTRAINT "imports_status_check" CHECK (status in ('running', 'completed', 'partial', 'failed', 'duplicate'))
);
--> statement-breakpoint
CREATE TABLE "job_steps" (
	"id" serial PRIMARY KEY NOT NULL,
	"work_order_id" integer NOT NULL,
	"step" integer NOT NULL,
	"name" text NOT NULL,
	"started_at" timestamp with time zone NOT NULL,
	"completed_at" timestamp with time zone NOT NULL,
	"guided" boolean NOT NULL,
	"technician" text,
	"import_id" integer,
	CONSTRAINT "job_steps_step_check" CHECK (step >= 1),
	CONSTRAINT "job_steps_duration_check" CHECK (completed_at > started_at)
);
--> statement-breakpoint
CREATE TABLE "mail_log" (
	"id" serial PRIMARY KEY NOT NULL,
	"recipients" text NOT NULL,
	"subject" text NOT NULL,
	"body" text NOT NULL,
	"status" text NOT NULL,
	"error" text,
	"sent_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "mail_log_status_check" CHECK (status in ('sent', 'failed'))
);
--> statement-breakpoint
CREATE TABLE "sample_coverage" (
	"import_id" integer NOT NULL,
	"tag_id" integer NOT NULL,
	"from_ts" timestamp with time zone NOT NULL,
	"to_ts" timestamp with time zone NOT NULL,
	"rows" integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sample_hourly" (
	"tag_id" integer NOT NULL,
	"hour" timestamp with time zone NOT NULL,
	"n" integer NOT NULL,
	"mean" double precision NOT NULL,
	"min" double precision NOT NULL,
	"max" double precision NOT NULL,
	"last" double precision NOT NULL,
	"last_ts" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "samples" (
	"tag_id" integer NOT NULL,
	"ts" timestamp with time zone NOT NULL,
	"value" double precision NOT NULL,
	"quality" smallint NOT NULL
);
--> statement-breakpoint
CREATE TABLE "settings" (
	"key" text PRIMARY KEY NOT NULL,
	"value" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_by" text
);
--> statement-breakpoint
CREATE TABLE "sites" (
	"id" serial PRIMARY KEY NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"time_zone" text DEFAULT 'UTC' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "sites_code_key" UNIQUE("code")
);
--> statement-breakpoint
CREATE TABLE "tags" (
	"id" serial PRIMARY KEY NOT NULL,
	"site_id" integer NOT NULL,
	"name" text NOT NULL,
	"asset_id" integer NOT NULL,
	"quantity" text NOT NULL,
	"source_unit" text DEFAULT '' NOT NULL,
	CONSTRAINT "tags_quantity_check" CHECK (quantity in ('run_status', 'feed_pressure', 'concentrate_pressure', 'permeate_pressure', 'feed_flow', 'permeate_flow', 'concentrate_flow', 'feed_conductivity', 'permeate_conductivity', 'feed_temperature'))
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" serial PRIMARY KEY NOT NULL,
	"email" text NOT NULL,
	"name" text DEFAULT '' NOT NULL,
	"password_hash" text NOT NULL,
	"role" text NOT NULL,
	"disabled" boolean DEFAULT false NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_login_at" timestamp with time zone,
	CONSTRAINT "users_role_check" CHECK (role in ('admin', 'engineer', 'manager', 'finance'))
);
--> statement-breakpoint
CREATE TABLE "work_orders" (
	"id" serial PRIMARY KEY NOT NULL,
	"site_id" integer NOT NULL,
	"wo_number" text NOT NULL,
	"asset_id" integer NOT NULL,
	"type" text NOT NULL,
	"priority" text NOT NULL,
	"status" text NOT NULL,
	"failure_code" text,
	"description" text DEFAULT '' NOT NULL,
	"reported_at" timestamp with time zone NOT NULL,
	"started_at" timestamp with time zone,
	"completed_at" timestamp with time zone,
	"out_of_service_from" timestamp with time zone,
	"out_of_service_to" timestamp with time zone,
	"labour_hours" double precision DEFAULT 0 NOT NULL,
	"labour_cost" double precision DEFAULT 0 NOT NULL,
	"parts_cost" double precision DEFAULT 0 NOT NULL,
	"crew" text,
	"import_id" integer,
	CONSTRAINT "work_orders_type_check" CHECK (type in ('corrective', 'preventive', 'predictive', 'inspection', 'improvement')),
	CONSTRAINT "work_orders_priority_check" CHECK (priority in ('low', 'medium', 'high', 'emergency')),
	CONSTRAINT "work_orders_status_check" CHECK (status in ('open', 'in_progress', 'closed', 'cancelled')),
	CONSTRAINT "work_orders_started_check" CHECK (started_at is null or started_at >= reported_at),
	CONSTRAINT "work_orders_completed_check" CHECK (completed_at is null or (started_at is not null and completed_at >= started_at)),
	CONSTRAINT "work_orders_oos_check" CHECK ((out_of_service_from is null) = (out_of_service_to is null) and (out_of_service_to is null or out_of_service_to >= out_of_service_from)),
	CONSTRAINT "work_orders_money_check" CHECK (labour_hours >= 0 and labour_cost >= 0 and parts_cost >= 0)
);
--> statement-breakpoint
ALTER TABLE "assets" ADD CONSTRAINT "assets_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "assets" ADD CONSTRAINT "assets_parent_id_assets_id_fk" FOREIGN KEY ("parent_id") REFERENCES "public"."assets"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "downtime_events" ADD CONSTRAINT "downtime_events_asset_id_assets_id_fk" FOREIGN KEY ("asset_id") REFERENCES "public"."assets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "downtime_events" ADD CONSTRAINT "downtime_events_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "elements" ADD CONSTRAINT "elements_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "elements" ADD CONSTRAINT "elements_vessel_id_assets_id_fk" FOREIGN KEY ("vessel_id") REFERENCES "public"."assets"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "elements" ADD CONSTRAINT "elements_import_id_imports_id_fk" FOREIGN KEY ("import_id") REFERENCES "public"."imports"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "import_rejects" ADD CONSTRAINT "import_rejects_import_id_imports_id_fk" FOREIGN KEY ("import_id") REFERENCES "public"."imports"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "imports" ADD CONSTRAINT "imports_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_steps" ADD CONSTRAINT "job_steps_work_order_id_work_orders_id_fk" FOREIGN KEY ("work_order_id") REFERENCES "public"."work_orders"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "job_steps" ADD CONSTRAINT "job_steps_import_id_imports_id_fk" FOREIGN KEY ("import_id") REFERENCES "public"."imports"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sample_coverage" ADD CONSTRAINT "sample_coverage_import_id_imports_id_fk" FOREIGN KEY ("import_id") REFERENCES "public"."imports"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "sample_coverage" ADD CONSTRAINT "sample_coverage_tag_id_tags_id_fk" FOREIGN KEY ("tag_id") REFERENCES "public"."tags"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tags" ADD CONSTRAINT "tags_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "tags" ADD CONSTRAINT "tags_asset_id_assets_id_fk" FOREIGN KEY ("asset_id") REFERENCES "public"."assets"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "work_orders" ADD CONSTRAINT "work_orders_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "work_orders" ADD CONSTRAINT "work_orders_asset_id_assets_id_fk" FOREIGN KEY ("asset_id") REFERENCES "public"."assets"("id") ON DELETE restrict ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "work_orders" ADD CONSTRAINT "work_orders_import_id_imports_id_fk" FOREIGN KEY ("import_id") REFERENCES "public"."imports"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "assets_site_code_key" ON "assets" USING btree ("site_id","code");--> statement-breakpoint
CREATE INDEX "assets_parent_idx" ON "assets" USING btree ("parent_id");--> statement-breakpoint
CREATE INDEX "dirty_hours_tag_idx" ON "dirty_hours" USING btree ("tag_id");--> statement-breakpoint
CREATE UNIQUE INDEX "downtime_events_asset_from_key" ON "downtime_events" USING btree ("asset_id","from_ts");--> statement-breakpoint
CREATE INDEX "downtime_events_from_idx" ON "downtime_events" USING btree ("from_ts");--> statement-breakpoint
CREATE UNIQUE INDEX "elements_site_serial_installed_key" ON "elements" USING btree ("site_id","serial","installed_at");--> statement-breakpoint
CREATE INDEX "elements_vessel_position_idx" ON "elements" USING btree ("vessel_id","position","installed_at");--> statement-breakpoint
CREATE INDEX "import_rejects_import_idx" ON "import_rejects" USING btree ("import_id","line");--> statement-breakpoint
CREATE INDEX "imports_started_idx" ON "imports" USING btree ("started_at");--> statement-breakpoint
CREATE UNIQUE INDEX "imports_landed_key" ON "imports" USING btree ("site_id","kind","sha256") WHERE status in ('completed', 'partial');--> statement-breakpoint
CREATE UNIQUE INDEX "job_steps_wo_step_key" ON "job_steps" USING btree ("work_order_id","step");--> statement-breakpoint
CREATE INDEX "sample_coverage_tag_idx" ON "sample_coverage" USING btree ("tag_id","from_ts","to_ts");--> statement-breakpoint
CREATE UNIQUE INDEX "sample_hourly_key" ON "sample_hourly" USING btree ("tag_id","hour");--> statement-breakpoint
CREATE INDEX "samples_ts_brin" ON "samples" USING brin ("ts") WITH (pages_per_range=16);--> statement-breakpoint
CREATE UNIQUE INDEX "tags_site_name_key" ON "tags" USING btree ("site_id","name");--> statement-breakpoint
CREATE INDEX "tags_asset_idx" ON "tags" USING btree ("asset_id","quantity");--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_key" ON "users" USING btree (lower("email"));--> statement-breakpoint
CREATE UNIQUE INDEX "work_orders_site_number_key" ON "work_orders" USING btree ("site_id","wo_number");--> statement-breakpoint
CREATE INDEX "work_orders_asset_reported_idx" ON "work_orders" USING btree ("asset_id","reported_at");