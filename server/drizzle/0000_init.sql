CREATE TABLE "scans" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "scans_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"title" text NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"plan" jsonb NOT NULL,
	"plan_text" text NOT NULL,
	"plan_hash" text NOT NULL,
	"physics_version" text NOT NULL,
	"state" text DEFAULT 'queued' NOT NULL,
	"point_count" integer NOT NULL,
	"points_done" integer DEFAULT 0 NOT NULL,
	"points_failed" integer DEFAULT 0 NOT NULL,
	"compute_seconds" double precision DEFAULT 0 NOT NULL,
	"error" text,
	"owner_id" integer,
	"group_id" integer,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "scans_state_check" CHECK (state in ('queued', 'running', 'completed', 'cancelled', 'failed'))
);
--> statement-breakpoint
CREATE TABLE "batches" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "batches_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"scan_id" integer NOT NULL,
	"first_index" integer NOT NULL,
	"point_count" integer NOT NULL,
	"state" text DEFAULT 'pending' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"worker_id" text,
	"leased_until" timestamp with time zone,
	"error" text,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	CONSTRAINT "batches_scan_id_first_index_key" UNIQUE("scan_id","first_index"),
	CONSTRAINT "batches_state_check" CHECK (state in ('pending', 'running', 'done', 'failed'))
);
--> statement-breakpoint
CREATE TABLE "point_results" (
	"scan_id" integer NOT NULL,
	"point_index" integer NOT NULL,
	"params" jsonb NOT NULL,
	"status" text NOT NULL,
	"reason" text DEFAULT '' NOT NULL,
	"n_total" double precision,
	"n_pivot" double precision,
	"phi_start" double precision,
	"phi_end" double precision,
	"phi_pivot" double precision,
	"delta_phi" double precision,
	"eps1" double precision,
	"eps2" double precision,
	"eps3" double precision,
	"ns" double precision,
	"r" double precision,
	"nt" double precision,
	"alpha_s" double precision,
	"a_s" double precision,
	"amplitude" double precision,
	"energy_scale_gev" double precision,
	"hubble_gev" double precision,
	"exact_ns" double precision,
	"exact_r" double precision,
	"exact_nt" double precision,
	"exact_alpha_s" double precision,
	"exact_a_s" double precision,
	"exact_amplitude" double precision,
	"chi2" double precision,
	"region" text,
	"compute_ms" double precision NOT NULL,
	"evaluations" integer,
	CONSTRAINT "point_results_pkey" PRIMARY KEY("scan_id","point_index")
);
--> statement-breakpoint
ALTER TABLE "batches" ADD CONSTRAINT "batches_scan_id_scans_id_fk" FOREIGN KEY ("scan_id") REFERENCES "public"."scans"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "point_results" ADD CONSTRAINT "point_results_scan_id_scans_id_fk" FOREIGN KEY ("scan_id") REFERENCES "public"."scans"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "scans_state_idx" ON "scans" USING btree ("state");--> statement-breakpoint
CREATE INDEX "scans_owner_id_idx" ON "scans" USING btree ("owner_id");--> statement-breakpoint
CREATE INDEX "scans_group_id_idx" ON "scans" USING btree ("group_id");--> statement-breakpoint
CREATE INDEX "batches_state_scan_id_idx" ON "batches" USING btree ("state","scan_id");--> statement-breakpoint
CREATE INDEX "point_results_scan_id_ns_idx" ON "point_results" USING btree ("scan_id","ns");--> statement-breakpoint
CREATE INDEX "point_results_scan_id_r_idx" ON "point_results" USING btree ("scan_id","r");--> statement-breakpoint
CREATE INDEX "point_results_scan_id_chi2_idx" ON "point_results" USING btree ("scan_id","chi2");--> statement-breakpoint
CREATE INDEX "point_results_scan_id_status_idx" ON "point_results" USING btree ("scan_id","status");