CREATE TABLE "job_spans" (
	"work_order_id" integer PRIMARY KEY NOT NULL,
	"first_start" timestamp with time zone NOT NULL,
	"last_end" timestamp with time zone NOT NULL,
	"guided" boolean NOT NULL,
	"steps" integer NOT NULL
);
--> statement-breakpoint
ALTER TABLE "job_spans" ADD CONSTRAINT "job_spans_work_order_id_work_orders_id_fk" FOREIGN KEY ("work_order_id") REFERENCES "public"."work_orders"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
-- Spans of the steps already imported (hand-added: the importer keeps them from here on).
INSERT INTO "job_spans" ("work_order_id", "first_start", "last_end", "guided", "steps")
SELECT "work_order_id", min("started_at"), max("completed_at"), bool_or("guided"), count(*)::int FROM "job_steps" GROUP BY "work_order_id";
